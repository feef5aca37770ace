"""The caution every hardware figure the tool prints carries."""

__all__ = ["CAUTION"]

CAUTION = (
    "Caution: these figures support, never replace, datasheet review, measurement on the "
    "real hardware, a design review, local codes and licensed practice. Mains and "
    "battery-powered bridges can injure and burn."
)
