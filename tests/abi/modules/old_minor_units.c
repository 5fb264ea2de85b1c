/* Test module built as against ABI 1.0: every header says minor 0, and its parameter descriptors
 * have the 1.0 layout, which ended before choice_count. A later host must load it and read the
 * fields 1.0 had. */
#include "copy_unit.h"

#include <math.h>

/* pfu_port as ABI 1.0 and 1.1 laid it out, before flags. */
typedef struct port_1_0 {
  pfu_header header;
  const char* name;
  const char* meaning;
  uint32_t direction;
  uint32_t phases;
} port_1_0;

/* pfu_parameter as ABI 1.0 laid it out. */
typedef struct parameter_1_0 {
  pfu_header header;
  const char* name;
  const char* unit;
  const char* meaning;
  uint32_t kind;
  double default_number;
  double lower;
  double upper;
  const char* default_text;
} parameter_1_0;

/* pfu_unit_class as ABI 1.0 to 1.2 laid it out, before solve_call. */
typedef struct unit_class_1_0 {
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
} unit_class_1_0;

#define HEADER_1_0(type) {PFU_ABI_MAJOR, 0, sizeof(type)}

static const port_1_0 ports[] = {
    {HEADER_1_0(port_1_0), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID},
    {HEADER_1_0(port_1_0), "product", "the same stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID},
};

static const parameter_1_0 parameters[] = {
    {HEADER_1_0(parameter_1_0), "pressure_drop", "Pa", "pressure lost", PFU_NUMBER, 0.0, 0.0, 1.0e6, NULL},
    {HEADER_1_0(parameter_1_0), "note", "", "free text, ignored", PFU_TEXT, 0.0, 0.0, 0.0, "none"},
};

static const pfu_result results[] = {
    {HEADER_1_0(pfu_result), "pressure_drop", "Pa", "pressure drop applied"},
};

static const unit_class_1_0 classes[] = {{
    HEADER_1_0(unit_class_1_0),
    "old_copy",
    "Copies its inlet less a pressure drop (a test module built for ABI 1.0)",
    2,
    2,
    1,
    (const pfu_port*)(const void*)ports,
    (const pfu_parameter*)(const void*)parameters, /* a 1.0 host would have declared it this way */
    results,
    copy_unit_create,
    copy_unit_solve,
    copy_unit_destroy,
}};

static const pfu_module table = {HEADER_1_0(pfu_module), "protonflow-abi-test-old-minor", "0.9.0", 1,
                                 (const pfu_unit_class*)(const void*)classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
