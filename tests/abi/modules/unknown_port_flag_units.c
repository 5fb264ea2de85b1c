/* Test module of a later minor with a port flag this host does not know (bit 30): what the flag
 * asks of a host cannot be guessed, so the host must refuse the module, naming the port and the
 * flag, rather than connect the port as if the flag were not there. */
#include "copy_unit.h"

#define LATER_HEADER(type) {PFU_ABI_MAJOR, PFU_ABI_MINOR + 1, sizeof(type)}

static const pfu_port ports[] = {
    {LATER_HEADER(pfu_port), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS, 0x40000000u, 0, 0},
    {LATER_HEADER(pfu_port), "product", "stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
};

static const pfu_unit_class classes[] = {{LATER_HEADER(pfu_unit_class), "flagged_copy",
                                          "A unit with a port flag from a later minor (a test module)", 2, 0, 0, ports,
                                          NULL, NULL, copy_unit_create, copy_unit_solve, copy_unit_destroy, NULL, 0,
                                          NULL}};

static const pfu_module table = {LATER_HEADER(pfu_module), "protonflow-abi-test-unknown-port-flag", "1.0.0", 1,
                                 classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
