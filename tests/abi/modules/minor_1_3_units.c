/* Test module built as against ABI 1.3, the last minor before the solve's flags: its headers say
 * minor 3, it declares no outlets-only capability, and its solve_call reads the call through the
 * 1.3 layout, which ended at message_capacity. A 1.4 host must load it, solve it in full on every
 * pass (even where it would pass other units PFU_SOLVE_OUTLETS_ONLY) and hand it a call it can
 * read. */
#include "copy_unit.h"

#include <stddef.h>

/* pfu_solve_call as ABI 1.3 laid it out, before flags. */
typedef struct solve_call_1_3 {
  pfu_header header;
  const pfu_stream_state* const* inlets;
  pfu_stream_state* const* outlets;
  const uint32_t* inlet_counts;
  const uint32_t* outlet_counts;
  uint32_t inlet_count;
  uint32_t outlet_count;
  double* results;
  uint32_t result_count;
  uint32_t series_count;
  pfu_series_buffer* const* series;
  char* warnings;
  size_t warnings_capacity;
  char* message;
  size_t message_capacity;
} solve_call_1_3;

#define HEADER_1_3(type) {PFU_ABI_MAJOR, 3, sizeof(type)}

/* The solve of 1.3 as a 1.3 module wrote it: the call must be at least as large as its own. */
static pfu_status solve_1_3(pfu_instance* instance, const pfu_solve_call* call) {
  const solve_call_1_3* read = (const solve_call_1_3*)(const void*)call;
  if (read == NULL || read->header.abi_major != PFU_ABI_MAJOR || read->header.struct_size < sizeof(solve_call_1_3)) {
    return PFU_INVALID_ARGUMENT;
  }
  return copy_unit_solve(instance, read->inlets, read->inlet_count, read->outlets, read->outlet_count, read->results,
                         read->result_count, read->warnings, read->warnings_capacity, read->message,
                         read->message_capacity);
}

static const pfu_port ports[] = {
    {HEADER_1_3(pfu_port), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID, 0, 0, 0},
    {HEADER_1_3(pfu_port), "product", "the same stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS | PFU_PHASE_GAS | PFU_PHASE_SOLID,
     0, 0, 0},
};

static const pfu_parameter parameters[] = {
    {HEADER_1_3(pfu_parameter), "pressure_drop", "Pa", "pressure lost", PFU_NUMBER, 0.0, 0.0, 1.0e6, NULL, 0, NULL},
};

static const pfu_result results[] = {
    {HEADER_1_3(pfu_result), "pressure_drop", "Pa", "pressure drop applied"},
};

static const pfu_unit_class classes[] = {{
    HEADER_1_3(pfu_unit_class),
    "copy_1_3",
    "Copies its inlet less a pressure drop (a test module built for ABI 1.3)",
    2,
    1,
    1,
    ports,
    parameters,
    results,
    copy_unit_create,
    copy_unit_solve,
    copy_unit_destroy,
    solve_1_3,
    0,
    NULL,
}};

static const pfu_module table = {HEADER_1_3(pfu_module), "protonflow-abi-test-minor-1-3", "1.3.0", 1, classes};

const pfu_module* protonflow_unit_module(void) { return &table; }
