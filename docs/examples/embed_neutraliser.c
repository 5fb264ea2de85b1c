/* Embedding the neutraliser in another plant model, in plain C99 with nothing but unit_abi.h: the
 * model owns the dosing loop. It creates the neutraliser with a fixed reagent flow, and on each pass
 * sets the flow, solves, reads the outlet pH and the process gain d(pH)/d(reagent flow) by their
 * result names, and takes a Newton step on the flow (kept inside a bracket that shrinks by
 * bisection when a step would leave it) until the pH meets its setpoint. It then asks a second
 * instance, in mode target_ph, for the same dose, and checks that both agree. ctest runs it; it
 * exits non-zero on any failure.
 *
 *   usage: embed_neutraliser libprotonflow_neutraliser.so
 */
#define _POSIX_C_SOURCE 200809L

#include <protonflow/unit_abi.h>

#include <dlfcn.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

enum { COMPONENTS = 3, PHASES = PFU_FIRST_SOLID_ROW, FLOWS = PHASES * COMPONENTS, MAX_RESULTS = 64 };

static const double water_mol_per_kg = 1.0 / 0.018015268; /* IAPWS-95 molar mass of water */
static const double setpoint = 6.0;                      /* pH */

static pfu_header header_of(size_t size) {
  pfu_header header;
  header.abi_major = PFU_ABI_MAJOR;
  header.abi_minor = PFU_ABI_MINOR;
  header.struct_size = (uint32_t)size;
  return header;
}

static pfu_stream_state stream(double temperature, double* flows) {
  pfu_stream_state state;
  state.header = header_of(sizeof state);
  state.temperature = temperature;
  state.pressure = 101325.0;
  state.phase_count = PHASES;
  state.component_count = COMPONENTS;
  state.flows = flows;
  return state;
}

static pfu_parameter_value text_value(const char* name, const char* text) {
  pfu_parameter_value value;
  value.header = header_of(sizeof value);
  value.name = name;
  value.kind = PFU_CHOICE;
  value.number = 0.0;
  value.text = text;
  return value;
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

/* Index of a declared result by name, stepping by the module's struct_size; -1 if absent. */
static int result_index(const pfu_unit_class* unit_class, const char* name) {
  uint32_t i;
  for (i = 0; i < unit_class->result_count; ++i) {
    const pfu_result* result = (const void*)((const char*)unit_class->results + (size_t)i * unit_class->results->header.struct_size);
    if (strcmp(result->name, name) == 0) return (int)i;
  }
  return -1;
}

/* The plant's streams: 1 kg/s of water carrying 0.05 mol/s acetic acid (the waste), and a 1 mol/kg
 * NaOH solution of which `dose` kg/s are pumped (the reagent). Components: H2O, CH3COOH, NaOH. */
static void plant_streams(double dose, double* feed, double* reagent) {
  const double solution_kg_per_kg_water = 1.0 + 1.0 * 0.0399971; /* 1 mol NaOH, 39.9971 g/mol */
  memset(feed, 0, FLOWS * sizeof *feed);
  memset(reagent, 0, FLOWS * sizeof *reagent);
  feed[PFU_AQUEOUS_ROW * COMPONENTS + 0] = water_mol_per_kg;
  feed[PFU_AQUEOUS_ROW * COMPONENTS + 1] = 0.05;
  reagent[PFU_AQUEOUS_ROW * COMPONENTS + 0] = dose / solution_kg_per_kg_water * water_mol_per_kg;
  reagent[PFU_AQUEOUS_ROW * COMPONENTS + 2] = dose / solution_kg_per_kg_water * 1.0;
}

static pfu_status solve_once(const pfu_unit_class* unit_class, pfu_instance* instance, double dose, double* results) {
  double feed[FLOWS], reagent[FLOWS], product[FLOWS], off_gas[FLOWS];
  pfu_stream_state feed_state, reagent_state, product_state, off_gas_state;
  const pfu_stream_state* inlets[2];
  pfu_stream_state* outlets[2];
  char message[1024], warnings[4096];
  pfu_status status;
  plant_streams(dose, feed, reagent);
  feed_state = stream(298.15, feed);
  reagent_state = stream(298.15, reagent);
  product_state = stream(0.0, product);
  off_gas_state = stream(0.0, off_gas);
  inlets[0] = &feed_state;
  inlets[1] = &reagent_state;
  outlets[0] = &product_state;
  outlets[1] = &off_gas_state;
  status = unit_class->solve(instance, inlets, 2, outlets, 2, results, unit_class->result_count, warnings, sizeof warnings,
                             message, sizeof message);
  if (status != PFU_OK) fprintf(stderr, "solve failed (%s): %s\n", pfu_status_name(status), message);
  return status;
}

static int dose_in_our_loop(const pfu_unit_class* unit_class) {
  static const char* const components[COMPONENTS] = {"H2O", "CH3COOH", "NaOH"};
  const int ph = result_index(unit_class, "outlet_ph");
  const int gain = result_index(unit_class, "process_gain");
  const int flow = result_index(unit_class, "reagent_flow");
  double results[MAX_RESULTS];
  double low = 0.0, high = 0.1, dose = 0.01, own = 0.0; /* kg/s of reagent; the bracket holds the answer */
  pfu_slate slate;
  pfu_parameter_value values[4];
  const pfu_parameter_value* list[4];
  char message[1024];
  pfu_instance* fixed;
  pfu_instance* target;
  int pass, ok = 0;

  if (ph < 0 || gain < 0 || flow < 0 || unit_class->result_count > MAX_RESULTS) {
    fprintf(stderr, "the neutraliser does not declare outlet_ph, process_gain and reagent_flow\n");
    return 0;
  }
  slate.header = header_of(sizeof slate);
  slate.component_count = COMPONENTS;
  slate.solid_count = 0;
  slate.components = components;
  slate.solids = NULL;
  values[0] = text_value("energy", "at_temperature");
  values[1] = number_value("outlet_temperature", 298.15);
  list[0] = &values[0];
  list[1] = &values[1];
  fixed = unit_class->create(list, 2, &slate, message, sizeof message);
  if (fixed == NULL) {
    fprintf(stderr, "create failed: %s\n", message);
    return 0;
  }
  for (pass = 0; pass < 50; ++pass) {
    double error, next;
    if (solve_once(unit_class, fixed, dose, results) != PFU_OK) break;
    error = results[ph] - setpoint;
    printf("pass %2d: dose %.9f kg/s, pH %.9f, gain %.4g s/kg\n", pass, dose, results[ph], results[gain]);
    if (fabs(error) < 1e-9) {
      ok = 1;
      break;
    }
    if (error < 0.0) low = dose; else high = dose;
    next = dose - error / results[gain];
    dose = next > low && next < high ? next : 0.5 * (low + high);
  }
  unit_class->destroy(fixed);
  if (!ok) {
    fprintf(stderr, "our loop did not reach pH %g\n", setpoint);
    return 0;
  }

  /* The unit's own dose search, for comparison: it must find the same dose. */
  values[2] = text_value("mode", "target_ph");
  values[3] = number_value("target_ph", setpoint);
  list[2] = &values[2];
  list[3] = &values[3];
  target = unit_class->create(list, 4, &slate, message, sizeof message);
  if (target == NULL) {
    fprintf(stderr, "create failed: %s\n", message);
    return 0;
  }
  if (solve_once(unit_class, target, 0.01, results) == PFU_OK) own = results[flow];
  unit_class->destroy(target);
  printf("our loop: %.9f kg/s; the unit's target_ph mode: %.9f kg/s\n", dose, own);
  /* The unit weighs water by atomic weights (18.01528 g/mol), this program by IAPWS-95's
   * 18.015268: the two doses in kg/s differ by that 7e-7, so they are compared to 2e-6. */
  if (!(fabs(own - dose) <= 2e-6 * dose)) {
    fprintf(stderr, "the two doses differ\n");
    return 0;
  }
  return 1;
}

int main(int argc, char** argv) {
  void* library;
  void* symbol;
  pfu_entry_fn entry;
  const pfu_module* module;
  const pfu_unit_class* neutraliser = NULL;
  uint32_t i;
  int ok = 0;

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
  if (module != NULL && module->header.abi_major == PFU_ABI_MAJOR && module->header.struct_size >= sizeof *module) {
    for (i = 0; i < module->class_count; ++i) {
      const pfu_unit_class* unit_class = (const void*)((const char*)module->classes + (size_t)i * module->classes->header.struct_size);
      if (strcmp(unit_class->type, "neutraliser") == 0) neutraliser = unit_class;
    }
  }
  if (neutraliser == NULL) {
    fprintf(stderr, "%s offers no neutraliser of unit ABI %d\n", argv[1], PFU_ABI_MAJOR);
  } else {
    ok = dose_in_our_loop(neutraliser);
  }
  dlclose(library); /* only after every instance is destroyed */
  printf("%s\n", ok ? "embedding worked" : "embedding FAILED");
  return ok ? 0 : 1;
}
