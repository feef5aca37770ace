/*
 * The pump drive's gate logic in C, one timer tick at a time (an invented example).
 *
 * Bits of a gate byte: 1 = AH, 2 = AL, 4 = BH, 8 = BL (1 = switch on).
 * Forward drives leg A with complementary PWM and holds BL on; reverse mirrors it;
 * brake turns both low sides on; coast and stop turn everything off.  A switch turns
 * off at once when no longer wanted and turns on only after its complement has been
 * off for dead_ticks ticks.
 *
 * Built with -DFULL_DUTY_BYPASS it has a fault: at full duty the gates are written
 * directly, skipping the dead-time logic.
 */
#include <stdint.h>

enum { MODE_COAST = 0, MODE_BRAKE = 1, MODE_FORWARD = 2, MODE_REVERSE = 3, MODE_STOP = 4 };

typedef struct {
    uint32_t period_ticks;
    uint32_t dead_ticks;
    uint32_t count;       /* position in the PWM period */
    uint8_t gates;        /* outputs in force */
    uint32_t off_for[4];  /* ticks each switch has been off (saturating) */
} pump_ctl;

#define BIT(sw) ((uint8_t)(1u << (sw)))
#define COMPLEMENT(sw) ((sw) ^ 1) /* AH <-> AL, BH <-> BL */

void pump_init(pump_ctl *c, uint32_t period_ticks, uint32_t dead_ticks)
{
    c->period_ticks = period_ticks;
    c->dead_ticks = dead_ticks;
    c->count = 0;
    c->gates = 0;
    for (int sw = 0; sw < 4; sw++)
        c->off_for[sw] = dead_ticks; /* off long enough already */
}

/* The switches the mode wants on in this tick, before dead-time insertion. */
static uint8_t wanted(const pump_ctl *c, int mode, uint32_t compare)
{
    int high_phase = c->count < compare;
    switch (mode) {
    case MODE_BRAKE:
        return BIT(1) | BIT(3);
    case MODE_FORWARD:
        return (high_phase ? BIT(0) : BIT(1)) | BIT(3);
    case MODE_REVERSE:
        return (high_phase ? BIT(2) : BIT(3)) | BIT(1);
    default: /* coast, stop */
        return 0;
    }
}

static void settle(pump_ctl *c, uint8_t gates)
{
    for (int sw = 0; sw < 4; sw++) {
        if (gates & BIT(sw))
            c->off_for[sw] = 0;
        else if (c->gates & BIT(sw))
            c->off_for[sw] = 0; /* turns off in this tick */
        else if (c->off_for[sw] < UINT32_MAX)
            c->off_for[sw]++;
    }
    c->gates = gates;
}

uint8_t pump_tick(pump_ctl *c, int mode, uint32_t compare)
{
    uint8_t want = wanted(c, mode, compare);
#ifdef FULL_DUTY_BYPASS
    if (mode == MODE_FORWARD && compare >= c->period_ticks) {
        settle(c, BIT(0) | BIT(3)); /* full duty: no edges to time, write the gates */
        goto next;
    }
#endif
    {
        uint8_t gates = c->gates & want; /* turn-offs take effect at once */
        for (int sw = 0; sw < 4; sw++) {
            int comp = COMPLEMENT(sw);
            int complement_ready = !(gates & BIT(comp))
                && (c->gates & BIT(comp) ? c->dead_ticks == 0 : c->off_for[comp] + 1 >= c->dead_ticks);
            if ((want & BIT(sw)) && !(gates & BIT(sw)) && complement_ready)
                gates |= BIT(sw);
        }
        settle(c, gates);
    }
#ifdef FULL_DUTY_BYPASS
next:
#endif
    c->count = c->count + 1 < c->period_ticks ? c->count + 1 : 0;
    return c->gates;
}

/* Run n ticks in one mode, writing each tick's gate byte to out[0..n). */
void pump_run(pump_ctl *c, int mode, uint32_t compare, uint32_t n, uint8_t *out)
{
    for (uint32_t i = 0; i < n; i++)
        out[i] = pump_tick(c, mode, compare);
}
