/* Test module built as against a future ABI 1.(current+1): each of its structs carries one more
 * field at the end, and its headers say so. A current host must load it, step through its arrays
 * by their struct_size and read only the fields it knows. */
#include "copy_unit.h"

/* The current layouts with the field a later minor might append. */
typedef struct future_port {
  pfu_port current;
  double added_later;
} future_port;
typedef struct future_parameter {
  pfu_parameter current;
  const char* added_later;
} future_parameter;
typedef struct future_result {
  pfu_result current;
  uint64_t added_later;
} future_result;
typedef struct future_unit_class {
  pfu_unit_class current;
  const char* added_later;
} future_unit_class;
typedef struct future_module {
  pfu_module current;
  const char* added_later;
} future_module;

#define FUTURE_HEADER(type) {PFU_ABI_MAJOR, PFU_ABI_MINOR + 1, sizeof(type)}

static const future_port ports[] = {
    {{FUTURE_HEADER(future_port), "feed", "stream in", PFU_INLET, PFU_PHASE_AQUEOUS, 0, 0, 0}, 1.0},
    {{FUTURE_HEADER(future_port), "product", "the same stream out", PFU_OUTLET, PFU_PHASE_AQUEOUS, 0, 0, 0}, 2.0},
};

/* A capability of the later minor that this host does not know; not required, so it is ignored. */
typedef struct future_capability {
  pfu_capability capability;
  double setting;
} future_capability;
static const future_capability later_feature = {
    {FUTURE_HEADER(future_capability), 1000, 0, "a later feature, optional"}, 3.0};
static const pfu_capability* const capabilities[] = {&later_feature.capability};

static const char* const note_choices[] = {"none", "some"};

static const future_parameter parameters[] = {
    {{FUTURE_HEADER(future_parameter), "pressure_drop", "Pa", "pressure lost", PFU_NUMBER, 0.0, 0.0, 1.0e6, NULL, 0,
      NULL},
     "unknown to this host"},
    {{FUTURE_HEADER(future_parameter), "note", "", "free text, ignored", PFU_CHOICE, 0.0, 0.0, 0.0, "none", 2,
      note_choices},
     "unknown to this host"},
};

static const future_result results[] = {
    {{FUTURE_HEADER(future_result), "pressure_drop", "Pa", "pressure drop applied"}, 7},
};

static const future_unit_class classes[] = {
    {{FUTURE_HEADER(future_unit_class), "future_copy",
      "Copies its inlet less a pressure drop (a test module built for a later minor)", 2, 2, 1,
      (const pfu_port*)(const void*)ports, (const pfu_parameter*)(const void*)parameters,
      (const pfu_result*)(const void*)results, copy_unit_create, copy_unit_solve, copy_unit_destroy, NULL, 1,
      capabilities},
     "unknown to this host"},
};

static const future_module table = {{FUTURE_HEADER(future_module), "protonflow-abi-test-newer-minor", "2.0.0", 1,
                                     (const pfu_unit_class*)(const void*)classes},
                                    "unknown to this host"};

const pfu_module* protonflow_unit_module(void) { return &table.current; }
