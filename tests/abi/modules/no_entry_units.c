/* Test module whose author misspelt the entry symbol: a shared library that loads, but is not a
 * unit module. The host must say which symbol it looked for. */
#include "copy_unit.h"

static const pfu_module table = {{PFU_ABI_MAJOR, PFU_ABI_MINOR, sizeof(pfu_module)}, "protonflow-abi-test-no-entry",
                                 "1.0.0", 0, NULL};

const pfu_module* protonflow_unit_modules(void);
const pfu_module* protonflow_unit_modules(void) { return &table; }
