/* A unit written in plain C against unit_abi.h: copies its inlet to its outlet, less an optional
 * pressure drop. Shared by the C test modules, which differ only in the tables they publish.
 * A test fixture, and an example of a module written without the C++ helper. */
#ifndef PROTONFLOW_TEST_COPY_UNIT_H
#define PROTONFLOW_TEST_COPY_UNIT_H

#include <protonflow/unit_abi.h>

/* Makes a copy unit from "pressure_drop" (Pa, 0 to 1e6) and "note" (text, ignored). */
pfu_instance* copy_unit_create(const pfu_parameter_value* const* values, uint32_t value_count,
                               const pfu_slate* slate, char* message, size_t message_capacity);

/* One inlet, one outlet, one result (the pressure drop applied, Pa). */
pfu_status copy_unit_solve(pfu_instance* instance, const pfu_stream_state* const* inlets, uint32_t inlet_count,
                           pfu_stream_state* const* outlets, uint32_t outlet_count, double* results,
                           uint32_t result_count, char* warnings, size_t warnings_capacity, char* message,
                           size_t message_capacity);

/* Frees what copy_unit_create made. */
void copy_unit_destroy(pfu_instance* instance);

#endif
