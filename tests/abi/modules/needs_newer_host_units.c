/* Test module of a later minor whose class needs a capability this host does not know, flagged
 * required (say, time stepping for a dynamic host): the host must refuse the module, naming the
 * capability, rather than run the class without it. */
#include "copy_unit.h"

typedef struct time_stepping {
  pfu_capability capability;
  double largest_step;
} time_stepping;

#define LATER_HEADER(type) {PFU_ABI_MAJOR, PFU_ABI_MINOR + 1, sizeof(type)}

static const time_stepping stepping = {{LATER_HEADER(time_stepping), 1000, PFU_CAPABILITY_REQUIRED, "time stepping"},
                                       1.0};
static const pfu_capability* const capabilities[] = {&stepping.capability};

static const pfu_port ports[] = {
    {LATER_HEADER(pfu_port), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
    {LATER_HEADER(pfu_port), "product", "stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS, 0, 0, 0},
};

static const pfu_unit_class classes[] = {{LATER_HEADER(pfu_unit_class), "dynamic_copy",
                                          "A unit that needs time stepping (a test module)", 2, 0, 0, ports, NULL, NULL,
                                          copy_unit_create, copy_unit_solve, copy_unit_destroy, NULL, 1, capabilities}};

static const pfu_module table = {LATER_HEADER(pfu_module), "protonflow-abi-test-needs-newer-host", "1.0.0", 1,
                                 classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
