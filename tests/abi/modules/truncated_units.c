/* Test module whose class descriptor claims a struct_size that ends before its function pointers,
 * as if built against a damaged header: the host must refuse it rather than read past the end. */
#include "copy_unit.h"

#include <stddef.h>

static const pfu_port ports[] = {
    {{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_port)}, "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
    {{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_port)}, "product", "stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
};

static const pfu_unit_class classes[] = {{{PFU_ABI_MAJOR, PFU_ABI_MINOR, offsetof(pfu_unit_class, create)},
                                          "truncated_copy",
                                          "A unit whose descriptor is too short (a test module)",
                                          2,
                                          0,
                                          0,
                                          ports,
                                          NULL,
                                          NULL,
                                          copy_unit_create,
                                          copy_unit_solve,
                                          copy_unit_destroy,
                                          NULL,
                                          0,
                                          NULL}};

static const pfu_module table = {{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_module)}, "protonflow-abi-test-truncated",
                                 "1.0.0", 1, classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
