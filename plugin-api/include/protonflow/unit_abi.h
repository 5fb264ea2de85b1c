/* protonflow unit ABI: the open C interface between a host and a module of unit operations.
 *
 * The complete specification is docs/unit-abi.md. This header is plain C99 and valid C++; it
 * carries no chemistry and no C++ types, and nothing declared here allocates. Everything a host
 * passes in is owned by the host; everything a module publishes (its tables and their strings) is
 * static and lives as long as the module stays loaded.
 *
 * Reentrancy: instances share nothing mutable. Two instances may be created, solved and destroyed
 * concurrently in different threads; one instance is used by one thread at a time. The entry
 * function and the tables it returns may be read from any thread at any time.
 */
#ifndef PROTONFLOW_UNIT_ABI_H
#define PROTONFLOW_UNIT_ABI_H

#include <stddef.h>
#include <stdint.h>

#ifdef __cplusplus
extern "C" {
#endif

/* Version of this header. A host loads a module whose major equals its own, whatever its minor:
 * a minor only appends fields at the ends of structs, so each side reads the fields both know.
 * What a later minor adds that a reader must understand is announced so a reader can refuse it by
 * name: port flags it does not know, capabilities marked required (docs/unit-abi.md §2). */
enum { PFU_ABI_MAJOR = 1, PFU_ABI_MINOR = 4 };

/* Opens every struct, so a reader can check the version and the size before reading further. */
typedef struct pfu_header {
  uint16_t abi_major;   /* PFU_ABI_MAJOR of the header the writer was built against */
  uint16_t abi_minor;   /* PFU_ABI_MINOR of the same */
  uint32_t struct_size; /* sizeof the whole struct as its writer built it, this header included */
} pfu_header;

/* What every function returns; a non-zero status leaves outlets and results unspecified. */
typedef int32_t pfu_status;
enum {
  PFU_OK = 0,
  PFU_INVALID_PARAMETER = 1, /* create: a parameter is unknown, of the wrong kind, missing or out of bounds */
  PFU_BAD_INLET = 2,         /* solve: an inlet state is unphysical or outside what the unit can handle */
  PFU_NOT_CONVERGED = 3,     /* solve: the unit's equations did not converge; the message has the residuals */
  PFU_BUFFER_TOO_SMALL = 4,  /* solve: the warnings did not fit; call again with a larger warnings buffer */
  PFU_INVALID_ARGUMENT = 5,  /* the call breaks this ABI: null pointer, wrong count or shape, struct too small */
  PFU_OUT_OF_MEMORY = 6,     /* the module could not allocate */
  PFU_INTERNAL_ERROR = 7     /* a fault inside the module; the message says what it knows */
};

/* Phases a port carries, as bits. Every solid phase of the slate counts as PFU_PHASE_SOLID. */
enum { PFU_PHASE_AQUEOUS = 1, PFU_PHASE_GAS = 2, PFU_PHASE_SOLID = 4 };

/* Row of a phase in a stream's flows: aqueous, gas, then the slate's solid phases in order. */
enum { PFU_AQUEOUS_ROW = 0, PFU_GAS_ROW = 1, PFU_FIRST_SOLID_ROW = 2 };

/* Port direction. */
enum { PFU_INLET = 1, PFU_OUTLET = 2 };

/* Port flags (since 1.2). An optional port may be left unconnected: the host then passes an
 * optional inlet with no flow, and refuses a solve that puts flow into an unconnected optional
 * outlet (nothing may be lost). A list port (since 1.3) takes from min_streams to max_streams
 * streams, which the host connects as a list and passes one after another in the port's place. A
 * reader refuses a port with a flag outside PFU_PORT_KNOWN_FLAGS of its own header. */
enum { PFU_PORT_OPTIONAL = 1, PFU_PORT_LIST = 2 };
enum { PFU_PORT_KNOWN_FLAGS = PFU_PORT_OPTIONAL | PFU_PORT_LIST };

/* max_streams of a list port without an upper bound. */
enum { PFU_UNBOUNDED_STREAMS = 0x7FFFFFFF };

/* Parameter kinds. A choice is a text restricted to a published list (since 1.1). */
enum { PFU_NUMBER = 1, PFU_TEXT = 2, PFU_CHOICE = 3 };

/* A port: where a stream enters or leaves a unit. */
typedef struct pfu_port {
  pfu_header header;
  const char* name;    /* unique among the class's ports, e.g. "feed" */
  const char* meaning; /* one line */
  uint32_t direction;  /* PFU_INLET or PFU_OUTLET */
  uint32_t phases;     /* PFU_PHASE_* bits: phases an inlet accepts, or an outlet may carry */
  /* since 1.2 */
  uint32_t flags;      /* PFU_PORT_* bits */
  /* since 1.3 */
  uint32_t min_streams; /* list port: fewest streams (0: it may stay unconnected); otherwise unused */
  uint32_t max_streams; /* list port: most streams, >= max(min_streams, 1), or PFU_UNBOUNDED_STREAMS */
} pfu_port;

/* A parameter a unit accepts at create. Bounds are inclusive; a number in SI units only. */
typedef struct pfu_parameter {
  pfu_header header;
  const char* name;         /* unique among the class's parameters, e.g. "pressure_drop" */
  const char* unit;         /* UDUNITS-2 string of the SI unit ("K", "Pa", "mol/s", "1"); "" unless a number */
  const char* meaning;      /* one line */
  uint32_t kind;            /* PFU_NUMBER, PFU_TEXT or PFU_CHOICE */
  double default_number;    /* number: the default, or NaN if the host must give the parameter */
  double lower;             /* number: lower bound, -HUGE_VAL if none */
  double upper;             /* number: upper bound, HUGE_VAL if none */
  const char* default_text; /* text and choice: the default, or NULL if the host must give it */
  /* since 1.1 */
  uint32_t choice_count;      /* choice: how many allowed values */
  const char* const* choices; /* choice: the allowed values */
} pfu_parameter;

/* A named number a unit reports after each solve. */
typedef struct pfu_result {
  pfu_header header;
  const char* name;    /* unique among the class's results, e.g. "duty" */
  const char* unit;    /* UDUNITS-2 string of the SI unit; "1" if dimensionless */
  const char* meaning; /* one line */
} pfu_result;

/* A named series a unit fills at each solve (since 1.3): points (x, y) such as a titration curve
 * or a column profile. Declared through the series capability below. */
typedef struct pfu_series {
  pfu_header header;
  const char* name;    /* unique among the class's series, e.g. "mixing_path" */
  const char* meaning; /* one line */
  const char* x_name;  /* e.g. "acid_fraction" */
  const char* x_unit;  /* UDUNITS-2 string of the SI unit; "1" if dimensionless */
  const char* y_name;  /* e.g. "temperature" */
  const char* y_unit;
  uint32_t max_points; /* the most points any instance fills, >= 1 */
} pfu_series;

/* The opaque state of one unit instance; only its module knows what it holds. */
typedef struct pfu_instance pfu_instance;

/* Capabilities (since 1.3): what a class offers beyond the fields of pfu_unit_class, each a struct
 * that begins with pfu_capability and is found by its id. A host reads those it knows (by
 * struct_size, like any struct) and ignores the others, unless one is flagged required: then it
 * refuses the class, naming the capability. New features come as new ids, so neither side needs
 * the other's minor to know them. */
enum { PFU_CAPABILITY_REQUIRED = 1 };
enum { PFU_CAPABILITY_SERIES = 1, PFU_CAPABILITY_OUTLETS_ONLY = 2 };

typedef struct pfu_capability {
  pfu_header header; /* struct_size: of the whole capability struct it opens */
  uint32_t id;       /* PFU_CAPABILITY_* */
  uint32_t flags;    /* PFU_CAPABILITY_REQUIRED: a host that does not know id must not use the class */
  const char* name;  /* for messages, e.g. "series" */
} pfu_capability;

/* Points an instance fills in series series_index at every solve, fixed when it is created and at
 * most that series' max_points. */
typedef uint32_t (*pfu_series_length_fn)(const pfu_instance* instance, uint32_t series_index);

/* PFU_CAPABILITY_SERIES: the series a class fills at solve. */
typedef struct pfu_series_capability {
  pfu_capability capability;     /* id PFU_CAPABILITY_SERIES */
  uint32_t series_count;
  const pfu_series* series;      /* stepped through by each element's struct_size */
  pfu_series_length_fn length;   /* NULL: every instance fills up to max_points */
} pfu_series_capability;

/* PFU_CAPABILITY_OUTLETS_ONLY (since 1.4): the class honours PFU_SOLVE_OUTLETS_ONLY, so it may skip
 * on such a solve what only a report reads (results, series, warnings, searches such as a stage
 * count for a limit). The capability is a bare pfu_capability; a host that does not know it passes
 * over it and the unit computes everything at every solve, as before. */

/* Flags of one solve (pfu_solve_call.flags, since 1.4). A module refuses a solve that sets a flag
 * outside PFU_SOLVE_KNOWN_FLAGS of its own header (PFU_INVALID_ARGUMENT, naming the flags). */
enum { PFU_SOLVE_OUTLETS_ONLY = 1 }; /* an iteration's pass: only the outlets will be read; set only for a
                                        class with PFU_CAPABILITY_OUTLETS_ONLY, whose results, series and
                                        warnings are then unspecified */
enum { PFU_SOLVE_KNOWN_FLAGS = PFU_SOLVE_OUTLETS_ONLY };

/* Where a solve writes one series: owned by the caller, like every buffer. */
typedef struct pfu_series_buffer {
  pfu_header header;
  uint32_t capacity; /* points x and y each hold: at least the instance's length for this series */
  uint32_t count;    /* written by the module: points filled, at most capacity */
  double* x;
  double* y;
} pfu_series_buffer;

/* The components and solid phases every stream of an instance carries, agreed once at create. */
typedef struct pfu_slate {
  pfu_header header;
  uint32_t component_count;
  uint32_t solid_count;
  const char* const* components; /* formula components, e.g. "H2O", "H2SO4", "CaSO4.2H2O" */
  const char* const* solids;     /* solid phases by database name, e.g. "gypsum"; row 2 + i */
} pfu_slate;

/* One parameter the host sets at create; parameters it leaves out take their defaults. */
typedef struct pfu_parameter_value {
  pfu_header header;
  const char* name; /* a parameter the class declares */
  uint32_t kind;    /* PFU_NUMBER (number is read) or PFU_TEXT (text is read, also for a choice) */
  double number;    /* in the parameter's declared SI unit */
  const char* text;
} pfu_parameter_value;

/* A stream: temperature, pressure and the molar flow of every component in every phase. */
typedef struct pfu_stream_state {
  pfu_header header;
  double temperature;       /* K */
  double pressure;          /* Pa, absolute */
  uint32_t phase_count;     /* 2 + the slate's solid_count */
  uint32_t component_count; /* the slate's component_count */
  double* flows;            /* mol/s, flows[row * component_count + component]; owned by the caller */
} pfu_stream_state;

/* Makes an instance from parameters and slate; returns NULL with a message if it rejects them. */
typedef pfu_instance* (*pfu_create_fn)(const pfu_parameter_value* const* values, uint32_t value_count,
                                       const pfu_slate* slate, char* message, size_t message_capacity);

/* Computes outlets and results from inlets (never written), with warnings as '\n'-ended lines. */
typedef pfu_status (*pfu_solve_fn)(pfu_instance* instance, const pfu_stream_state* const* inlets,
                                   uint32_t inlet_count, pfu_stream_state* const* outlets, uint32_t outlet_count,
                                   double* results, uint32_t result_count, char* warnings, size_t warnings_capacity,
                                   char* message, size_t message_capacity);

/* Frees an instance; NULL is ignored. */
typedef void (*pfu_destroy_fn)(pfu_instance* instance);

/* Everything one solve takes and gives (since 1.3), in one struct that later minors extend at its
 * end. Streams are passed port by port in port order: inlet_counts[p] streams for the p-th inlet
 * port (one for a plain port, the connected list for a list port), likewise for outlets. */
typedef struct pfu_solve_call {
  pfu_header header;
  const pfu_stream_state* const* inlets; /* inlet_count streams, port by port */
  pfu_stream_state* const* outlets;      /* outlet_count streams, port by port */
  const uint32_t* inlet_counts;          /* one per inlet port; they add up to inlet_count */
  const uint32_t* outlet_counts;         /* one per outlet port; they add up to outlet_count */
  uint32_t inlet_count;
  uint32_t outlet_count;
  double* results;                       /* result_count doubles, in declared order */
  uint32_t result_count;
  uint32_t series_count;                 /* the class's series count, or 0: fill none */
  pfu_series_buffer* const* series;      /* one per declared series, in declared order */
  char* warnings;
  size_t warnings_capacity;
  char* message;
  size_t message_capacity;
  /* since 1.4; a call of 1.3 ends before it, and reads as no flags */
  uint32_t flags;                        /* PFU_SOLVE_* bits */
} pfu_solve_call;

/* The solve of 1.3 on; inlets are never written; the warnings and message as for pfu_solve_fn. */
typedef pfu_status (*pfu_solve_call_fn)(pfu_instance* instance, const pfu_solve_call* call);

/* A kind of unit a module offers: its self-description and its three functions. */
typedef struct pfu_unit_class {
  pfu_header header;
  const char* type;    /* the name flowsheets use, e.g. "neutraliser" */
  const char* summary; /* one line */
  uint32_t port_count;
  uint32_t parameter_count;
  uint32_t result_count;
  const pfu_port* ports;           /* inlets and outlets; solve takes each direction in this order */
  const pfu_parameter* parameters; /* a host steps through these arrays by each element's struct_size */
  const pfu_result* results;       /* solve writes results[i] for the i-th of these */
  pfu_create_fn create;
  pfu_solve_fn solve;       /* one stream per port and no series; the only solve a 1.2 host calls */
  pfu_destroy_fn destroy;
  /* since 1.3 */
  pfu_solve_call_fn solve_call;              /* list ports and series; a 1.3 host calls it when present */
  uint32_t capability_count;
  const pfu_capability* const* capabilities; /* each points to a struct that opens with pfu_capability */
} pfu_unit_class;

/* What a module's entry symbol returns: the module's name and version and its unit classes. */
typedef struct pfu_module {
  pfu_header header;
  const char* name;    /* e.g. "protonflow-plain-units" */
  const char* version; /* the module's own version, e.g. "0.1.0"; not the ABI version */
  uint32_t class_count;
  const pfu_unit_class* classes; /* stepped through by each element's struct_size */
} pfu_module;

/* Type of the entry symbol: returns the module's static table; never fails, never allocates. */
typedef const pfu_module* (*pfu_entry_fn)(void);

/* The one symbol every module exports (by this C name, unmangled). */
const pfu_module* protonflow_unit_module(void);

/* The entry symbol's name, for dlsym and its kin. */
static inline const char* pfu_entry_symbol(void) { return "protonflow_unit_module"; }

/* A short fixed name for a status code, for messages; "unknown status" outside the enum. */
static inline const char* pfu_status_name(pfu_status status) {
  switch (status) {
    case PFU_OK: return "ok";
    case PFU_INVALID_PARAMETER: return "invalid parameter";
    case PFU_BAD_INLET: return "bad inlet";
    case PFU_NOT_CONVERGED: return "not converged";
    case PFU_BUFFER_TOO_SMALL: return "buffer too small";
    case PFU_INVALID_ARGUMENT: return "invalid argument";
    case PFU_OUT_OF_MEMORY: return "out of memory";
    case PFU_INTERNAL_ERROR: return "internal error";
    default: return "unknown status";
  }
}

#ifdef __cplusplus
}
#endif

#endif /* PROTONFLOW_UNIT_ABI_H */
