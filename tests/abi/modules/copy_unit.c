/* See copy_unit.h. Plain C99; allocates only in create, writes nothing but its buffers. */
#include "copy_unit.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* The instance: what solve needs of the slate and the parameters, nothing shared. */
struct pfu_instance {
  uint32_t phase_count;
  uint32_t component_count;
  double pressure_drop;
};

static void write_message(char* buffer, size_t capacity, const char* text) {
  if (buffer != NULL && capacity > 0) snprintf(buffer, capacity, "%s", text);
}

pfu_instance* copy_unit_create(const pfu_parameter_value* const* values, uint32_t value_count,
                               const pfu_slate* slate, char* message, size_t message_capacity) {
  double pressure_drop = 0.0;
  uint32_t i;
  pfu_instance* instance;
  write_message(message, message_capacity, "");
  if (slate == NULL || slate->header.abi_major != PFU_ABI_MAJOR || slate->header.struct_size < sizeof(pfu_slate) ||
      slate->component_count == 0) {
    write_message(message, message_capacity, "copy unit: missing, incompatible or empty slate");
    return NULL;
  }
  for (i = 0; i < value_count; ++i) {
    const pfu_parameter_value* value = values[i];
    if (strcmp(value->name, "note") == 0 && value->kind == PFU_TEXT) continue; /* free text, ignored */
    if (strcmp(value->name, "pressure_drop") != 0) {
      if (message != NULL && message_capacity > 0) {
        snprintf(message, message_capacity, "copy unit: unknown parameter '%s' (known: pressure_drop, note)",
                 value->name);
      }
      return NULL;
    }
    if (value->kind != PFU_NUMBER || !(value->number >= 0.0 && value->number <= 1.0e6)) {
      write_message(message, message_capacity, "copy unit: pressure_drop must be a number in [0, 1e6] Pa");
      return NULL;
    }
    pressure_drop = value->number;
  }
  instance = malloc(sizeof *instance);
  if (instance == NULL) {
    write_message(message, message_capacity, "copy unit: out of memory");
    return NULL;
  }
  instance->phase_count = PFU_FIRST_SOLID_ROW + slate->solid_count;
  instance->component_count = slate->component_count;
  instance->pressure_drop = pressure_drop;
  return instance;
}

pfu_status copy_unit_solve(pfu_instance* instance, const pfu_stream_state* const* inlets, uint32_t inlet_count,
                           pfu_stream_state* const* outlets, uint32_t outlet_count, double* results,
                           uint32_t result_count, char* warnings, size_t warnings_capacity, char* message,
                           size_t message_capacity) {
  const pfu_stream_state* in;
  pfu_stream_state* out;
  size_t k;
  size_t n;
  write_message(message, message_capacity, "");
  write_message(warnings, warnings_capacity, "");
  if (instance == NULL || inlet_count != 1 || outlet_count != 1 || result_count != 1 || inlets == NULL ||
      outlets == NULL || results == NULL || inlets[0] == NULL || outlets[0] == NULL) {
    write_message(message, message_capacity, "copy unit: takes one instance, one inlet, one outlet and one result");
    return PFU_INVALID_ARGUMENT;
  }
  in = inlets[0];
  out = outlets[0];
  if (in->phase_count != instance->phase_count || in->component_count != instance->component_count ||
      out->phase_count != instance->phase_count || out->component_count != instance->component_count) {
    write_message(message, message_capacity, "copy unit: a stream does not have the slate's shape");
    return PFU_INVALID_ARGUMENT;
  }
  if (!(in->temperature > 0.0) || !(in->pressure > instance->pressure_drop)) {
    write_message(message, message_capacity, "copy unit: inlet temperature or pressure too low");
    return PFU_BAD_INLET;
  }
  n = (size_t)instance->phase_count * instance->component_count;
  for (k = 0; k < n; ++k) {
    if (!(in->flows[k] >= 0.0) || !isfinite(in->flows[k])) {
      write_message(message, message_capacity, "copy unit: an inlet flow is negative or not finite");
      return PFU_BAD_INLET;
    }
    out->flows[k] = in->flows[k];
  }
  out->temperature = in->temperature;
  out->pressure = in->pressure - instance->pressure_drop;
  results[0] = instance->pressure_drop;
  return PFU_OK;
}

void copy_unit_destroy(pfu_instance* instance) { free(instance); }
