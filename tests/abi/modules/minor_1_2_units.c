/* Test module built as against ABI 1.2, the last minor before list ports and series: its ports end
 * after flags and its class descriptor after destroy, and its headers say minor 2. A 1.3 host must
 * load it, read its ports as plain ports (one stream each; the optional flag kept) and solve it
 * through the solve of 1.2. */
#include "copy_unit.h"

/* pfu_port as ABI 1.2 laid it out. */
typedef struct port_1_2 {
  pfu_header header;
  const char* name;
  const char* meaning;
  uint32_t direction;
  uint32_t phases;
  uint32_t flags;
} port_1_2;

/* pfu_unit_class as ABI 1.2 laid it out. */
typedef struct unit_class_1_2 {
  pfu_header header;
  const char* type;
  const char* summary;
  uint32_t port_count;
  uint32_t parameter_count;
  uint32_t result_count;
  const pfu_port* ports;
  const pfu_parameter* parameters;
  const pfu_result* results;
  pfu_create_fn create;
  pfu_solve_fn solve;
  pfu_destroy_fn destroy;
} unit_class_1_2;

#define HEADER_1_2(type) {PFU_ABI_MAJOR, 2, sizeof(type)}

static const port_1_2 ports[] = {
    {HEADER_1_2(port_1_2), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID, 0},
    {HEADER_1_2(port_1_2), "product", "the same stream out", PFU_OUTLET,
     PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID, PFU_PORT_OPTIONAL},
};

static const pfu_result results[] = {
    {HEADER_1_2(pfu_result), "pressure_drop", "Pa", "pressure drop applied"},
};

static const unit_class_1_2 classes[] = {{
    HEADER_1_2(unit_class_1_2),
    "copy_1_2",
    "Copies its inlet less a pressure drop (a test module built for ABI 1.2)",
    2,
    0,
    1,
    (const pfu_port*)(const void*)ports,
    NULL,
    results,
    copy_unit_create,
    copy_unit_solve,
    copy_unit_destroy,
}};

static const pfu_module table = {HEADER_1_2(pfu_module), "protonflow-abi-test-minor-1-2", "1.2.0", 1,
                                 (const pfu_unit_class*)(const void*)classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
