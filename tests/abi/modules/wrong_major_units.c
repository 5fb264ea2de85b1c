/* Test module built as against a future ABI 2.0: a host of major 1 must refuse it, naming both
 * versions and the file, before reading anything past the module table's header. */
#include "copy_unit.h"

static const pfu_port ports[] = {
    {{PFU_ABI_MAJOR + 1, 0, sizeof(pfu_port)}, "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
    {{PFU_ABI_MAJOR + 1, 0, sizeof(pfu_port)}, "product", "stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
};

static const pfu_result results[] = {{{PFU_ABI_MAJOR + 1, 0, sizeof(pfu_result)}, "pressure_drop", "Pa", "drop"}};

static const pfu_unit_class classes[] = {{{PFU_ABI_MAJOR + 1, 0, sizeof(pfu_unit_class)},
                                          "major_two_copy",
                                          "A unit from a module of the next major version (a test module)",
                                          2,
                                          0,
                                          1,
                                          ports,
                                          NULL,
                                          results,
                                          copy_unit_create,
                                          copy_unit_solve,
                                          copy_unit_destroy,
                                          NULL,
                                          0,
                                          NULL}};

static const pfu_module table = {{PFU_ABI_MAJOR + 1, 0, sizeof(pfu_module)}, "protonflow-abi-test-wrong-major", "1.0.0",
                                 1, classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
