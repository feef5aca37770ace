import inspect

import sequencecheck


def test_all_is_sorted_and_complete():
    names = list(sequencecheck.__all__)
    assert len(names) == len(set(names))  # order: ruff's RUF022 keeps it sorted
    public = {
        n
        for n, v in vars(sequencecheck).items()
        if not n.startswith("_") and not inspect.ismodule(v)
    }
    assert public == set(names) - {"__version__"}


def test_rule_ids_are_unique():
    ids = [r.id for r in sequencecheck.RULES]
    assert len(ids) == len(set(ids))
