/* Embedding a protonflow unit in another program, in plain C99 with nothing but unit_abi.h:
 * load a module, check its version, list its unit classes, create a mixer, solve it in our own
 * loop over several inlet states, print the results, destroy it; then solve a unit with a list
 * port and read the series it fills (unit ABI 1.3). This is what another simulator does to use a
 * protonflow unit. ctest runs it on the ABI test module; it exits non-zero on any failure, so it
 * is a test as well as an example.
 *
 *   usage: embed_unit MODULE.so
 */
#define _POSIX_C_SOURCE 200809L

#include <protonflow/unit_abi.h>

#include <dlfcn.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

enum { COMPONENTS = 4, SOLIDS = 1, PHASES = PFU_FIRST_SOLID_ROW + SOLIDS, FLOWS = PHASES * COMPONENTS };

/* Element i of a descriptor array: arrays are stepped through by their elements' struct_size,
 * which may differ from this program's sizeof when the module was built for another minor. */
static const void* element(const void* first, uint32_t i) {
  const pfu_header* header = first;
  return (const char*)first + (size_t)i * header->struct_size;
}

/* Whether a struct the module wrote is of our major and holds at least the bytes we read. */
static int readable(const pfu_header* header, size_t needed, const char* what, const char* file) {
  if (header->abi_major != PFU_ABI_MAJOR) {
    fprintf(stderr, "%s: %s was built for unit ABI %u.%u; this host speaks %d.%d\n", file, what,
            (unsigned)header->abi_major, (unsigned)header->abi_minor, PFU_ABI_MAJOR, PFU_ABI_MINOR);
    return 0;
  }
  if (header->struct_size < needed) {
    fprintf(stderr, "%s: %s is %u bytes; this host needs %u\n", file, what, (unsigned)header->struct_size,
            (unsigned)needed);
    return 0;
  }
  return 1;
}

static const char* phase_list(uint32_t phases, char* text, size_t capacity) {
  snprintf(text, capacity, "%s%s%s", phases & PFU_PHASE_AQUEOUS ? " aqueous" : "", phases & PFU_PHASE_GAS ? " gas" : "",
           phases & PFU_PHASE_SOLID ? " solid" : "");
  return text;
}

/* Prints one class from its descriptor alone, as a host's unit listing would. */
static int list_class(const pfu_unit_class* unit_class, const char* file) {
  uint32_t i;
  char phases[32];
  printf("unit %s: %s\n", unit_class->type, unit_class->summary);
  for (i = 0; i < unit_class->port_count; ++i) {
    const pfu_port* port = element(unit_class->ports, i);
    if (!readable(&port->header, sizeof *port, "a port", file)) return 0;
    printf("  port %-10s %-6s%s  %s\n", port->name, port->direction == PFU_INLET ? "in" : "out",
           phase_list(port->phases, phases, sizeof phases), port->meaning);
  }
  for (i = 0; i < unit_class->parameter_count; ++i) {
    const pfu_parameter* parameter = element(unit_class->parameters, i);
    /* choice_count and choices came with 1.1; everything before them is in every 1.x module */
    if (!readable(&parameter->header, offsetof(pfu_parameter, choice_count), "a parameter", file)) return 0;
    if (parameter->kind == PFU_NUMBER) {
      printf("  parameter %s [%s] default %g, bounds [%g, %g]: %s\n", parameter->name, parameter->unit,
             parameter->default_number, parameter->lower, parameter->upper, parameter->meaning);
    } else {
      printf("  parameter %s (text) default '%s': %s", parameter->name,
             parameter->default_text != NULL ? parameter->default_text : "(must be given)", parameter->meaning);
      if (parameter->kind == PFU_CHOICE && parameter->header.struct_size >= sizeof *parameter) {
        uint32_t c;
        printf("; one of");
        for (c = 0; c < parameter->choice_count; ++c) printf(" '%s'", parameter->choices[c]);
      }
      printf("\n");
    }
  }
  for (i = 0; i < unit_class->result_count; ++i) {
    const pfu_result* result = element(unit_class->results, i);
    if (!readable(&result->header, sizeof *result, "a result", file)) return 0;
    printf("  result %s [%s]: %s\n", result->name, result->unit, result->meaning);
  }
  return 1;
}

static pfu_header header_of(size_t size) {
  pfu_header header;
  header.abi_major = PFU_ABI_MAJOR;
  header.abi_minor = PFU_ABI_MINOR;
  header.struct_size = (uint32_t)size;
  return header;
}

static pfu_stream_state stream(double temperature, double pressure, double* flows) {
  pfu_stream_state state;
  state.header = header_of(sizeof state);
  state.temperature = temperature;
  state.pressure = pressure;
  state.phase_count = PHASES;
  state.component_count = COMPONENTS;
  state.flows = flows;
  return state;
}

static pfu_parameter_value number_value(const char* name, double number) {
  pfu_parameter_value value;
  value.header = header_of(sizeof value);
  value.name = name;
  value.kind = PFU_NUMBER;
  value.number = number;
  value.text = NULL;
  return value;
}

/* Creates a mixer and solves it over several inlet states, checking every answer. */
static int run_mixer(const pfu_unit_class* mixer) {
  static const char* const components[COMPONENTS] = {"H2O", "H2SO4", "NaOH", "CO2"};
  static const char* const solids[SOLIDS] = {"gypsum"};
  const double warning_temperature = 330.0; /* K */
  const double pressure_drop = 1000.0;      /* Pa */
  char message[512];
  char warnings[2048];
  double results[2];
  double feed_1[FLOWS] = {0}, feed_2[FLOWS] = {0}, product[FLOWS];
  pfu_slate slate;
  pfu_parameter_value values[2];
  const pfu_parameter_value* value_list[2];
  pfu_instance* instance;
  int step, k, ok = 1;

  slate.header = header_of(sizeof slate);
  slate.component_count = COMPONENTS;
  slate.solid_count = SOLIDS;
  slate.components = components;
  slate.solids = solids;

  /* A parameter out of its bounds must be refused with a message, not silently clamped. */
  values[0] = number_value("pressure_drop", -5.0);
  value_list[0] = &values[0];
  instance = mixer->create(value_list, 1, &slate, message, sizeof message);
  if (instance != NULL || message[0] == '\0') {
    fprintf(stderr, "the mixer accepted a negative pressure drop\n");
    mixer->destroy(instance);
    return 0;
  }
  printf("refused as expected: %s\n", message);

  values[0] = number_value("pressure_drop", pressure_drop);
  values[1] = number_value("warning_temperature", warning_temperature);
  value_list[0] = &values[0];
  value_list[1] = &values[1];
  instance = mixer->create(value_list, 2, &slate, message, sizeof message);
  if (instance == NULL) {
    fprintf(stderr, "create failed: %s\n", message);
    return 0;
  }

  for (step = 0; step < 5 && ok; ++step) {
    /* 1 mol/s water at 25 degC with a little acid, mixed with hotter caustic liquor. */
    const double hot = 300.0 + 30.0 * step; /* K */
    pfu_stream_state inlet_1, inlet_2, outlet;
    const pfu_stream_state* inlets[2];
    pfu_stream_state* outlets[1];
    pfu_status status;
    double expected_t;
    feed_1[PFU_AQUEOUS_ROW * COMPONENTS + 0] = 1.0;
    feed_1[PFU_AQUEOUS_ROW * COMPONENTS + 1] = 0.01;
    feed_2[PFU_AQUEOUS_ROW * COMPONENTS + 0] = 0.5;
    feed_2[PFU_AQUEOUS_ROW * COMPONENTS + 2] = 0.02;
    feed_2[PFU_GAS_ROW * COMPONENTS + 3] = 0.001 * step;
    inlet_1 = stream(298.15, 101325.0, feed_1);
    inlet_2 = stream(hot, 120000.0, feed_2);
    outlet = stream(0.0, 0.0, product);
    inlets[0] = &inlet_1;
    inlets[1] = &inlet_2;
    outlets[0] = &outlet;

    status = mixer->solve(instance, inlets, 2, outlets, 1, results, 2, warnings, sizeof warnings, message,
                          sizeof message);
    if (status != PFU_OK) {
      fprintf(stderr, "solve %d failed (%s): %s\n", step, pfu_status_name(status), message);
      ok = 0;
      break;
    }
    printf("step %d: T %.2f K, P %.0f Pa, total flow %.4f mol/s, spread %.1f K\n", step, outlet.temperature,
           outlet.pressure, results[0], results[1]);
    if (warnings[0] != '\0') printf("  warning: %s", warnings);

    /* Mass balance per phase and component, and the mixer's own energy rule, as checks. */
    for (k = 0; k < FLOWS; ++k) {
      if (fabs(product[k] - (feed_1[k] + feed_2[k])) > 1e-15) {
        fprintf(stderr, "step %d: flow %d does not balance\n", step, k);
        ok = 0;
      }
    }
    {
      double n1 = 0.0, n2 = 0.0;
      for (k = 0; k < FLOWS; ++k) {
        n1 += feed_1[k];
        n2 += feed_2[k];
      }
      expected_t = (n1 * 298.15 + n2 * hot) / (n1 + n2);
      if (fabs(outlet.temperature - expected_t) > 1e-9 || fabs(results[0] - (n1 + n2)) > 1e-12) {
        fprintf(stderr, "step %d: temperature or total flow wrong\n", step);
        ok = 0;
      }
    }
    if (fabs(outlet.pressure - (101325.0 - pressure_drop)) > 1e-9) {
      fprintf(stderr, "step %d: pressure %g Pa is not the lowest inlet less the drop\n", step, outlet.pressure);
      ok = 0;
    }
    if ((outlet.temperature > warning_temperature) != (warnings[0] != '\0')) {
      fprintf(stderr, "step %d: a warning is missing or unexpected\n", step);
      ok = 0;
    }
  }
  mixer->destroy(instance);
  return ok;
}

/* The series capability of a class, or NULL: capabilities came with 1.3, each found by its id. */
static const pfu_series_capability* series_of(const pfu_unit_class* unit_class) {
  uint32_t i;
  if (unit_class->header.abi_minor < 3 || unit_class->header.struct_size < sizeof *unit_class) return NULL;
  for (i = 0; i < unit_class->capability_count; ++i) {
    const pfu_capability* capability = unit_class->capabilities[i];
    if (capability->id == PFU_CAPABILITY_SERIES && capability->header.struct_size >= sizeof(pfu_series_capability)) {
      return (const pfu_series_capability*)(const void*)capability;
    }
  }
  return NULL;
}

/* Three streams on the blender's list inlet, two on its list outlet, and its two series read back:
 * one point per inlet blended, and a profile whose length the instance fixed at create. */
static int run_blender(const pfu_unit_class* blender) {
  static const char* const components[COMPONENTS] = {"H2O", "H2SO4", "NaOH", "CO2"};
  static const char* const solids[SOLIDS] = {"gypsum"};
  enum { INLETS = 3, OUTLETS = 2, MAX_POINTS = 64 };
  const double temperatures[INLETS] = {300.0, 360.0, 330.0}; /* K */
  const double water[INLETS] = {1.0, 3.0, 1.0};              /* mol/s */
  const pfu_series_capability* capability = series_of(blender);
  char message[512];
  double flows[INLETS][FLOWS] = {{0}}, shares[OUTLETS][FLOWS];
  double total_flow;
  double xs[2][MAX_POINTS], ys[2][MAX_POINTS];
  pfu_stream_state inlet_states[INLETS], outlet_states[OUTLETS];
  const pfu_stream_state* inlets[INLETS];
  pfu_stream_state* outlets[OUTLETS];
  const uint32_t inlet_counts[1] = {INLETS}, outlet_counts[1] = {OUTLETS};
  pfu_series_buffer buffers[2];
  pfu_series_buffer* buffer_list[2];
  pfu_solve_call call;
  pfu_slate slate;
  pfu_instance* instance;
  pfu_status status;
  uint32_t s, i;
  int k, ok = 1;
  double blend = 0.0, total = 0.0;

  if (blender->solve_call == NULL || capability == NULL || capability->series_count != 2) {
    fprintf(stderr, "the blender lacks the solve of unit ABI 1.3 or its two series\n");
    return 0;
  }
  slate.header = header_of(sizeof slate);
  slate.component_count = COMPONENTS;
  slate.solid_count = SOLIDS;
  slate.components = components;
  slate.solids = solids;
  instance = blender->create(NULL, 0, &slate, message, sizeof message);
  if (instance == NULL) {
    fprintf(stderr, "create failed: %s\n", message);
    return 0;
  }
  for (k = 0; k < INLETS; ++k) {
    flows[k][PFU_AQUEOUS_ROW * COMPONENTS + 0] = water[k];
    inlet_states[k] = stream(temperatures[k], 101325.0, flows[k]);
    inlets[k] = &inlet_states[k];
    blend += water[k] * temperatures[k];
    total += water[k];
  }
  blend /= total;
  for (k = 0; k < OUTLETS; ++k) {
    outlet_states[k] = stream(0.0, 0.0, shares[k]);
    outlets[k] = &outlet_states[k];
  }
  /* Each series gets a caller-owned buffer at least as long as the instance says it fills. */
  for (s = 0; s < 2; ++s) {
    const pfu_series* series = element(capability->series, s);
    const uint32_t length = capability->length != NULL ? capability->length(instance, s) : series->max_points;
    if (length > MAX_POINTS) {
      fprintf(stderr, "series %s needs %u points\n", series->name, (unsigned)length);
      blender->destroy(instance);
      return 0;
    }
    buffers[s].header = header_of(sizeof buffers[s]);
    buffers[s].capacity = length;
    buffers[s].count = 0;
    buffers[s].x = xs[s];
    buffers[s].y = ys[s];
    buffer_list[s] = &buffers[s];
  }
  call.header = header_of(sizeof call);
  call.inlets = inlets;
  call.outlets = outlets;
  call.inlet_counts = inlet_counts;
  call.outlet_counts = outlet_counts;
  call.inlet_count = INLETS;
  call.outlet_count = OUTLETS;
  call.results = &total_flow;
  call.result_count = 1;
  call.series_count = 2;
  call.series = buffer_list;
  call.warnings = NULL;
  call.warnings_capacity = 0;
  call.message = message;
  call.message_capacity = sizeof message;
  call.flags = 0; /* since 1.4: a full solve, results and series wanted */
  status = blender->solve_call(instance, &call);
  if (status != PFU_OK) {
    fprintf(stderr, "blender solve failed (%s): %s\n", pfu_status_name(status), message);
    blender->destroy(instance);
    return 0;
  }
  printf("blender: %u inlets into %u outlets at %.2f K, %.3f mol/s\n", (unsigned)INLETS, (unsigned)OUTLETS,
         outlet_states[0].temperature, total_flow);
  for (s = 0; s < 2; ++s) {
    const pfu_series* series = element(capability->series, s);
    printf("  series %s (%s [%s] -> %s [%s]), %u points:", series->name, series->x_name, series->x_unit, series->y_name,
           series->y_unit, (unsigned)buffers[s].count);
    for (i = 0; i < buffers[s].count; ++i) printf(" (%g, %g)", xs[s][i], ys[s][i]);
    printf("\n");
  }
  /* Checks: one blend point per inlet ending at the flow-weighted mean, the profile full and
   * ending there too, and the shares adding up to the feeds. */
  if (buffers[0].count != INLETS || fabs(ys[0][INLETS - 1] - blend) > 1e-9 || fabs(xs[0][INLETS - 1] - total) > 1e-12) {
    fprintf(stderr, "the blend series is wrong\n");
    ok = 0;
  }
  if (buffers[1].count != buffers[1].capacity || fabs(ys[1][buffers[1].count - 1] - blend) > 1e-9) {
    fprintf(stderr, "the profile series is wrong\n");
    ok = 0;
  }
  if (fabs(shares[0][0] + shares[1][0] - total) > 1e-12 || fabs(outlet_states[1].temperature - blend) > 1e-9) {
    fprintf(stderr, "the shares do not balance\n");
    ok = 0;
  }
  blender->destroy(instance);
  return ok;
}

int main(int argc, char** argv) {
  void* library;
  void* symbol;
  pfu_entry_fn entry;
  const pfu_module* module;
  const pfu_unit_class* mixer = NULL;
  const pfu_unit_class* blender = NULL;
  uint32_t i;
  int ok;

  if (argc != 2) {
    fprintf(stderr, "usage: %s MODULE\n", argv[0]);
    return 2;
  }
  library = dlopen(argv[1], RTLD_NOW | RTLD_LOCAL);
  if (library == NULL) {
    fprintf(stderr, "cannot load %s: %s\n", argv[1], dlerror());
    return 1;
  }
  symbol = dlsym(library, pfu_entry_symbol());
  if (symbol == NULL) {
    fprintf(stderr, "%s exports no %s\n", argv[1], pfu_entry_symbol());
    dlclose(library);
    return 1;
  }
  memcpy(&entry, &symbol, sizeof entry); /* ISO C has no object-to-function pointer cast; POSIX allows this */
  module = entry();
  if (module == NULL || !readable(&module->header, sizeof *module, "the module table", argv[1])) {
    dlclose(library);
    return 1;
  }
  printf("module %s %s, unit ABI %u.%u, %u classes\n", module->name, module->version,
         (unsigned)module->header.abi_major, (unsigned)module->header.abi_minor, (unsigned)module->class_count);

  ok = 1;
  for (i = 0; i < module->class_count && ok; ++i) {
    const pfu_unit_class* unit_class = element(module->classes, i);
    ok = readable(&unit_class->header, sizeof *unit_class, "a unit class", argv[1]) && list_class(unit_class, argv[1]);
    if (ok && strcmp(unit_class->type, "mixer") == 0) mixer = unit_class;
    if (ok && strcmp(unit_class->type, "blender") == 0) blender = unit_class;
  }
  if (ok && (mixer == NULL || blender == NULL)) {
    fprintf(stderr, "%s offers no mixer or no blender\n", argv[1]);
    ok = 0;
  }
  if (ok) ok = run_mixer(mixer);
  if (ok) ok = run_blender(blender);
  dlclose(library); /* only after every instance is destroyed */
  printf("%s\n", ok ? "embedding worked" : "embedding FAILED");
  return ok ? 0 : 1;
}
