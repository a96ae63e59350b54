/* rotorq's instruction-count plugin for QEMU's TCG (plugin API version 1, as in QEMU 7.2).
 *
 * Counts the instructions a guest executes between two marker functions of the benchmark
 * firmware, and sorts them into classes by their mnemonic. Arguments (comma-separated, as QEMU
 * passes them):
 *   begin=<hex address>   first instruction of the begin marker: a region starts when it executes
 *   end=<hex address>     first instruction of the end marker: the region ends there
 *   arch=arm|riscv        how to read the mnemonics
 *   out=<path>            where to write the regions (default: QEMU's log, stderr)
 *   classes=<path>        also write every translated instruction with its class (to check the
 *                         classification: "<address> <class> <disassembly>")
 * The driver (rotorq-cycles) reads both addresses from the ELF with nm; bit 0 (the Thumb bit) is
 * ignored. QEMU 7.2 gives a plugin no access to registers, so regions carry no names: the firmware
 * prints each region's name through semihosting just before it, in the same order, and the driver
 * pairs the n-th name with the n-th line written here:
 *   region <n> insns <count> <class>=<count> ...
 * Counting is deterministic: the same ELF gives the same lines on every run.
 *
 * Classes are decided once, when an instruction is translated (qemu_plugin_insn_disas); the
 * per-execution callback only adds to counters. A conditional branch is counted as taken or not
 * taken when the next instruction executes: not taken when that is the fall-through address.
 * ARM loads and stores that directly follow another load or store get their own classes (the
 * Cortex-M3/M4 pipeline overlaps such neighbours), as do POP/LDM that load the PC (a return).
 *
 * No QEMU header is included: Debian ships none, and the few declarations below are all this
 * plugin uses of the public API (docs/devel/tcg-plugins.rst in QEMU's source describes it). */
#include <ctype.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

/* ---- the part of QEMU's public plugin API used here (version 1) -------------------------------- */
typedef uint64_t qemu_plugin_id_t;
struct qemu_info_t; /* opaque here: nothing of it is read */
struct qemu_plugin_tb;
struct qemu_plugin_insn;
enum qemu_plugin_cb_flags { QEMU_PLUGIN_CB_NO_REGS, QEMU_PLUGIN_CB_R_REGS, QEMU_PLUGIN_CB_RW_REGS };
typedef void (*qemu_plugin_vcpu_tb_trans_cb_t)(qemu_plugin_id_t id, struct qemu_plugin_tb* tb);
typedef void (*qemu_plugin_vcpu_udata_cb_t)(unsigned int vcpu_index, void* userdata);
typedef void (*qemu_plugin_udata_cb_t)(qemu_plugin_id_t id, void* userdata);
void qemu_plugin_register_vcpu_tb_trans_cb(qemu_plugin_id_t id, qemu_plugin_vcpu_tb_trans_cb_t cb);
void qemu_plugin_register_vcpu_insn_exec_cb(struct qemu_plugin_insn* insn, qemu_plugin_vcpu_udata_cb_t cb,
                                            enum qemu_plugin_cb_flags flags, void* userdata);
void qemu_plugin_register_atexit_cb(qemu_plugin_id_t id, qemu_plugin_udata_cb_t cb, void* userdata);
size_t qemu_plugin_tb_n_insns(const struct qemu_plugin_tb* tb);
struct qemu_plugin_insn* qemu_plugin_tb_get_insn(const struct qemu_plugin_tb* tb, size_t idx);
size_t qemu_plugin_insn_size(const struct qemu_plugin_insn* insn);
uint64_t qemu_plugin_insn_vaddr(const struct qemu_plugin_insn* insn);
char* qemu_plugin_insn_disas(const struct qemu_plugin_insn* insn);
void qemu_plugin_outs(const char* string);

#define ROTORQ_PLUGIN_EXPORT __attribute__((visibility("default")))
ROTORQ_PLUGIN_EXPORT extern const int qemu_plugin_version;
ROTORQ_PLUGIN_EXPORT const int qemu_plugin_version = 1;
ROTORQ_PLUGIN_EXPORT int qemu_plugin_install(qemu_plugin_id_t id, const struct qemu_info_t* info, int argc,
                                             char** argv);

/* ---- instruction classes ------------------------------------------------------------------------ */
/* The names are what the driver's cost models (benchmarks/target/cost_models.json) price. */
enum insn_class {
  class_alu,
  class_it,
  class_mul,
  class_mac,
  class_mul_long,
  class_mac_long,
  class_div,
  class_dsp,
  class_load,
  class_load_next,
  class_store,
  class_store_next,
  class_load_pair,
  class_store_pair,
  class_load_multiple,
  class_store_multiple,
  class_pop_pc,
  class_branch,
  class_call,
  class_return,
  class_cond_taken,
  class_cond_not_taken,
  class_fp_add,
  class_fp_mul,
  class_fp_mac,
  class_fp_div,
  class_fp_sqrt,
  class_fp_cvt,
  class_fp_cmp,
  class_fp_move,
  class_fp_load,
  class_fp_store,
  class_fp_load_multiple,
  class_fp_store_multiple,
  class_fp_double,
  class_system,
  class_other,
  class_count,
  /* a conditional branch, resolved into cond_taken or cond_not_taken when the next insn runs */
  class_conditional = class_count
};
static const char* const class_names[] = {
    "alu",
    "it",
    "mul",
    "mac",
    "mul_long",
    "mac_long",
    "div",
    "dsp",
    "load",
    "load_next",
    "store",
    "store_next",
    "load_pair",
    "store_pair",
    "load_multiple",
    "store_multiple",
    "pop_pc",
    "branch",
    "call",
    "return",
    "cond_taken",
    "cond_not_taken",
    "fp_add",
    "fp_mul",
    "fp_mac",
    "fp_div",
    "fp_sqrt",
    "fp_cvt",
    "fp_cmp",
    "fp_move",
    "fp_load",
    "fp_store",
    "fp_load_multiple",
    "fp_store_multiple",
    "fp_double",
    "system",
    "other",
};
_Static_assert(sizeof class_names / sizeof class_names[0] == class_count, "a name for every class");

/* What the executed callback needs of one translated instruction. */
struct insn_info {
  uint64_t vaddr;
  uint64_t next; /* the fall-through address */
  int cls;       /* an insn_class, or class_conditional */
  int memory;    /* 1 for a single load or store (ARM): its neighbour may pipeline with it */
  int registers; /* words a load/store multiple moves (its register list), else 0 */
};

static uint64_t begin_address = UINT64_MAX;
static uint64_t end_address = UINT64_MAX;
static int arch_riscv = 0;
static FILE* output = NULL;
static FILE* class_dump = NULL;

static int counting = 0;
static unsigned long region_index = 0;
static uint64_t counts[class_count];
static uint64_t registers[class_count]; /* words moved by the load/store-multiple classes */
static uint64_t total = 0;
static const struct insn_info* pending_branch = NULL;
static int previous_memory = 0;

/* ---- mnemonic classification -------------------------------------------------------------------- */
static int in_list(const char* m, const char* const* list) {
  for (; *list != NULL; ++list) {
    if (strcmp(m, *list) == 0) return 1;
  }
  return 0;
}

static const char* const arm_conditions[] = {"eq", "ne", "cs", "hs", "cc", "lo", "mi", "pl", "vs",
                                             "vc", "hi", "ls", "ge", "lt", "gt", "le", "al", NULL};

static const char* const arm_alu[] = {
    "add",   "adc",  "sub",   "sbc",   "rsb",  "and",  "orr",  "orn",  "eor",  "bic",   "mov",   "mvn",
    "cmp",   "cmn",  "tst",   "teq",   "lsl",  "lsr",  "asr",  "ror",  "rrx",  "neg",   "adr",   "movw",
    "movt",  "ubfx", "sbfx",  "bfi",   "bfc",  "uxtb", "uxth", "sxtb", "sxth", "uxtab", "uxtah", "sxtab",
    "sxtah", "rev",  "rev16", "revsh", "rbit", "clz",  "nop",  "addw", "subw", "cpy",   NULL};
static const char* const arm_mul[] = {"mul",   "smulbb", "smulbt", "smultb", "smultt", "smulwb", "smulwt",
                                      "smuad", "smuadx", "smusd",  "smusdx", "smmul",  "smmulr", NULL};
static const char* const arm_mac[] = {"mla",    "mls",    "smlabb", "smlabt", "smlatb", "smlatt",
                                      "smlawb", "smlawt", "smlad",  "smladx", "smlsd",  "smlsdx",
                                      "smmla",  "smmlar", "smmls",  "smmlsr", NULL};
static const char* const arm_mul_long[] = {"smull", "umull", NULL};
static const char* const arm_mac_long[] = {"smlal",   "umlal",  "umaal",   "smlalbb", "smlalbt", "smlaltb",
                                           "smlaltt", "smlald", "smlaldx", "smlsld",  "smlsldx", NULL};
static const char* const arm_div[] = {"sdiv", "udiv", NULL};
static const char* const arm_load[] = {"ldr",   "ldrb",   "ldrh",   "ldrsb", "ldrsh",
                                       "ldrex", "ldrexb", "ldrexh", "ldrt",  NULL};
static const char* const arm_store[] = {"str", "strb", "strh", "strex", "strexb", "strexh", "strt", NULL};
static const char* const arm_system[] = {"svc", "bkpt", "mrs", "msr", "cpsid", "cpsie", "dmb",   "dsb",
                                         "isb", "wfi",  "wfe", "sev", "yield", "udf",   "clrex", NULL};
/* Saturating and SIMD arithmetic of the DSP extension (and SSAT/USAT, also on Armv7-M). */
static int arm_is_dsp(const char* m) {
  static const char* const exact[] = {"ssat",  "usat", "ssat16", "usat16", "qadd",  "qsub",   "qdadd",
                                      "qdsub", "sel",  "pkhbt",  "pkhtb",  "usad8", "usada8", NULL};
  if (in_list(m, exact)) return 1;
  /* parallel add/subtract: [s|q|sh|u|uq|uh](add16|sub16|add8|sub8|asx|sax) */
  static const char* const prefixes[] = {"s", "q", "sh", "u", "uq", "uh", NULL};
  static const char* const ops[] = {"add16", "sub16", "add8", "sub8", "asx", "sax", NULL};
  for (const char* const* p = prefixes; *p != NULL; ++p) {
    const size_t n = strlen(*p);
    if (strncmp(m, *p, n) == 0 && in_list(m + n, ops)) return 1;
  }
  return 0;
}

/* Class of a base ARM mnemonic (no condition, no width or type suffix), or -1. */
static int arm_base_class(const char* m, const char* operands) {
  if (in_list(m, arm_alu)) return class_alu;
  if (in_list(m, arm_mul)) return class_mul;
  if (in_list(m, arm_mac)) return class_mac;
  if (in_list(m, arm_mul_long)) return class_mul_long;
  if (in_list(m, arm_mac_long)) return class_mac_long;
  if (in_list(m, arm_div)) return class_div;
  if (arm_is_dsp(m)) return class_dsp;
  const int writes_pc = strstr(operands, "pc") != NULL;
  if (in_list(m, arm_load)) {
    /* ldr pc, [...] is a branch through memory */
    return strncmp(operands, "pc", 2) == 0 ? class_pop_pc : class_load;
  }
  if (in_list(m, arm_store)) return class_store;
  if (strcmp(m, "ldrd") == 0) return class_load_pair;
  if (strcmp(m, "strd") == 0) return class_store_pair;
  if (strcmp(m, "pop") == 0 || strncmp(m, "ldm", 3) == 0) {
    return writes_pc ? class_pop_pc : class_load_multiple;
  }
  if (strcmp(m, "push") == 0 || strncmp(m, "stm", 3) == 0) return class_store_multiple;
  if (strcmp(m, "b") == 0 || strcmp(m, "tbb") == 0 || strcmp(m, "tbh") == 0) return class_branch;
  if (strcmp(m, "bl") == 0 || strcmp(m, "blx") == 0) return class_call;
  if (strcmp(m, "bx") == 0) return class_return;
  if (strcmp(m, "cbz") == 0 || strcmp(m, "cbnz") == 0) return class_conditional;
  if (in_list(m, arm_system)) return class_system;
  return -1;
}

static int ends_with(const char* s, const char* suffix) {
  const size_t n = strlen(s), k = strlen(suffix);
  return n >= k && strcmp(s + n - k, suffix) == 0;
}

static int arm_fp_class(const char* m, const char* full) {
  /* full still has its type suffix (.f32, .f64, ...) */
  if (strstr(full, ".f64") != NULL && strncmp(m, "vmov", 4) != 0 && strncmp(m, "vldr", 4) != 0 &&
      strncmp(m, "vstr", 4) != 0 && strncmp(m, "vcvt", 4) != 0)
    return class_fp_double;
  if (strcmp(m, "vadd") == 0 || strcmp(m, "vsub") == 0 || strcmp(m, "vabs") == 0 || strcmp(m, "vneg") == 0 ||
      strcmp(m, "vsel") == 0 || strncmp(m, "vmaxnm", 6) == 0 || strncmp(m, "vminnm", 6) == 0 ||
      strncmp(m, "vsel", 4) == 0)
    return class_fp_add;
  if (strcmp(m, "vmul") == 0 || strcmp(m, "vnmul") == 0) return class_fp_mul;
  if (strcmp(m, "vmla") == 0 || strcmp(m, "vmls") == 0 || strcmp(m, "vnmla") == 0 ||
      strcmp(m, "vnmls") == 0 || strcmp(m, "vfma") == 0 || strcmp(m, "vfms") == 0 ||
      strcmp(m, "vfnma") == 0 || strcmp(m, "vfnms") == 0)
    return class_fp_mac;
  if (strcmp(m, "vdiv") == 0) return class_fp_div;
  if (strcmp(m, "vsqrt") == 0) return class_fp_sqrt;
  if (strncmp(m, "vcvt", 4) == 0 || strncmp(m, "vrint", 5) == 0) return class_fp_cvt;
  if (strncmp(m, "vcmp", 4) == 0 || strcmp(m, "vmrs") == 0 || strcmp(m, "vmsr") == 0) return class_fp_cmp;
  if (strcmp(m, "vmov") == 0) return class_fp_move;
  if (strcmp(m, "vldr") == 0) return class_fp_load;
  if (strcmp(m, "vstr") == 0) return class_fp_store;
  if (strcmp(m, "vpop") == 0 || strncmp(m, "vldm", 4) == 0) return class_fp_load_multiple;
  if (strcmp(m, "vpush") == 0 || strncmp(m, "vstm", 4) == 0) return class_fp_store_multiple;
  return class_other;
}

static int arm_class(const char* mnemonic, const char* operands) {
  char full[32];
  snprintf(full, sizeof full, "%s", mnemonic);
  char m[32];
  snprintf(m, sizeof m, "%s", mnemonic);
  char* dot = strchr(m, '.');
  if (dot != NULL) *dot = '\0'; /* .w, .n, .f32, .s32, ... */
  if (m[0] == 'v') {
    const int c = arm_fp_class(m, full);
    /* else strip a condition (IT block): vmovge -> vmov (but vmls is not vm + ls) */
    const size_t n = strlen(m);
    if (c != class_other || n <= 4 || !in_list(m + n - 2, arm_conditions)) return c;
    m[n - 2] = '\0';
    return arm_fp_class(m, full);
  }
  if (m[0] == 'i' && m[1] == 't') return class_it;
  int c = arm_base_class(m, operands);
  if (c >= 0) return c;
  const size_t n = strlen(m);
  /* a conditional branch: b<cond> */
  if (n == 3 && m[0] == 'b' && in_list(m + 1, arm_conditions)) return class_conditional;
  /* a condition inside an IT block, and/or the flag-setting S: addseq, addeq, adds */
  char base[32];
  if (n > 2 && in_list(m + n - 2, arm_conditions)) {
    snprintf(base, sizeof base, "%.*s", (int)(n - 2), m);
    /* bxeq lr, bleq: a conditional return or call is still a conditional branch */
    if (strcmp(base, "bx") == 0 || strcmp(base, "bl") == 0 || strcmp(base, "blx") == 0)
      return class_conditional;
    c = arm_base_class(base, operands);
    if (c >= 0) return c;
    if (ends_with(base, "s")) {
      base[strlen(base) - 1] = '\0';
      c = arm_base_class(base, operands);
      if (c >= 0) return c;
    }
  }
  if (ends_with(m, "s")) {
    snprintf(base, sizeof base, "%.*s", (int)(n - 1), m);
    c = arm_base_class(base, operands);
    if (c >= 0) return c;
  }
  return class_other;
}

static int riscv_class(const char* mnemonic, const char* operands) {
  const char* m = mnemonic;
  if (strncmp(m, "c.", 2) == 0) m += 2; /* compressed forms, if the disassembler names them so */
  static const char* const alu[] = {
      "add", "addi", "sub", "and",  "andi", "or",   "ori",  "xor",   "xori",     "sll",      "slli",
      "srl", "srli", "sra", "srai", "slt",  "slti", "sltu", "sltiu", "lui",      "auipc",    "mv",
      "li",  "nop",  "not", "neg",  "seqz", "snez", "sltz", "sgtz",  "addi16sp", "addi4spn", NULL};
  static const char* const load[] = {"lb", "lh", "lw", "lbu", "lhu", "lwsp", NULL};
  static const char* const store[] = {"sb", "sh", "sw", "swsp", NULL};
  static const char* const cond[] = {"beq",  "bne",  "blt",  "bge", "bltu", "bgeu", "beqz", "bnez", "blez",
                                     "bgez", "bltz", "bgtz", "bgt", "ble",  "bgtu", "bleu", NULL};
  if (in_list(m, alu)) return class_alu;
  if (strcmp(m, "mul") == 0) return class_mul;
  if (strcmp(m, "mulh") == 0 || strcmp(m, "mulhu") == 0 || strcmp(m, "mulhsu") == 0) return class_mul_long;
  if (strcmp(m, "div") == 0 || strcmp(m, "divu") == 0 || strcmp(m, "rem") == 0 || strcmp(m, "remu") == 0)
    return class_div;
  if (in_list(m, load)) return class_load;
  if (in_list(m, store)) return class_store;
  if (in_list(m, cond)) return class_conditional;
  if (strcmp(m, "j") == 0) return class_branch;
  if (strcmp(m, "ret") == 0) return class_return;
  if (strcmp(m, "jr") == 0) return strcmp(operands, "ra") == 0 ? class_return : class_branch;
  if (strcmp(m, "jal") == 0 || strcmp(m, "call") == 0) {
    /* jal with rd = zero is a plain jump */
    return strncmp(operands, "zero", 4) == 0 ? class_branch : class_call;
  }
  if (strcmp(m, "jalr") == 0) {
    if (strncmp(operands, "zero", 4) == 0)
      return strstr(operands, "ra") != NULL ? class_return : class_branch;
    return class_call;
  }
  if (strcmp(m, "tail") == 0) return class_branch;
  if (strcmp(m, "ecall") == 0 || strcmp(m, "ebreak") == 0 || strncmp(m, "fence", 5) == 0 ||
      strncmp(m, "csr", 3) == 0 || strcmp(m, "wfi") == 0 || strcmp(m, "mret") == 0)
    return class_system;
  return class_other;
}

/* Words moved by an ARM register list, "{r4, r5, lr}" or "{d8, d9}" (a d register is two words);
 * a range "r4-r7" counts every register in it. */
static int list_words(const char* operands) {
  const char* open = strchr(operands, '{');
  if (open == NULL) return 0;
  int words = 0;
  const char* p = open + 1;
  while (*p != '\0' && *p != '}') {
    while (*p == ' ' || *p == ',') ++p;
    if (*p == '}' || *p == '\0') break;
    const int width = *p == 'd' ? 2 : 1;
    const char* start = p;
    while (*p != '\0' && *p != ',' && *p != '}' && *p != '-') ++p;
    int count = 1;
    if (*p == '-') {
      /* a range: the numbers after the register letters */
      const char* a = start;
      while (*a != '\0' && !isdigit((unsigned char)*a)) ++a;
      const char* b = p + 1;
      while (*b != '\0' && !isdigit((unsigned char)*b)) ++b;
      count = atoi(b) - atoi(a) + 1;
      ++p;
      while (*p != '\0' && *p != ',' && *p != '}') ++p;
    }
    words += width * (count > 0 ? count : 1);
  }
  return words;
}

/* Splits QEMU's disassembly ("ldr r3, [pc, #0x18]", "addi a0,a0,1") into a lower-case mnemonic and
 * its operands, and classifies it. */
static int classify(const char* text, int* memory, int* words) {
  char mnemonic[32];
  size_t i = 0;
  while (*text == ' ' || *text == '\t') ++text;
  if (arch_riscv) {
    /* QEMU's RISC-V disassembler starts with the encoding: 4 or 8 hex digits */
    size_t k = 0;
    while (isxdigit((unsigned char)text[k])) ++k;
    if ((k == 4 || k == 8) && (text[k] == ' ' || text[k] == '\t')) {
      text += k;
      while (*text == ' ' || *text == '\t') ++text;
    }
  }
  while (text[i] != '\0' && text[i] != ' ' && text[i] != '\t' && i + 1 < sizeof mnemonic) {
    mnemonic[i] = (char)tolower((unsigned char)text[i]);
    ++i;
  }
  mnemonic[i] = '\0';
  const char* operands = text + i;
  while (*operands == ' ' || *operands == '\t') ++operands;
  const int c = arch_riscv ? riscv_class(mnemonic, operands) : arm_class(mnemonic, operands);
  *memory = !arch_riscv && (c == class_load || c == class_store);
  *words = 0;
  if (c == class_load_multiple || c == class_store_multiple || c == class_pop_pc ||
      c == class_fp_load_multiple || c == class_fp_store_multiple)
    *words = list_words(operands);
  return c;
}

/* ---- callbacks ---------------------------------------------------------------------------------- */
static void emit_region(void) {
  char line[2048];
  int n = snprintf(line, sizeof line, "region %lu insns %llu", region_index, (unsigned long long)total);
  for (int c = 0; c < class_count && n > 0 && (size_t)n < sizeof line; ++c) {
    if (counts[c] != 0)
      n += snprintf(line + n, sizeof line - (size_t)n, " %s=%llu", class_names[c],
                    (unsigned long long)counts[c]);
  }
  for (int c = 0; c < class_count && n > 0 && (size_t)n < sizeof line; ++c) {
    if (registers[c] != 0)
      n += snprintf(line + n, sizeof line - (size_t)n, " %s.words=%llu", class_names[c],
                    (unsigned long long)registers[c]);
  }
  if (output != NULL) {
    fprintf(output, "%s\n", line);
  } else {
    qemu_plugin_outs(line);
    qemu_plugin_outs("\n");
  }
  ++region_index;
}

static void on_exec(unsigned int vcpu_index, void* userdata) {
  (void)vcpu_index;
  const struct insn_info* insn = (const struct insn_info*)userdata;
  if (pending_branch != NULL) {
    if (counting) counts[insn->vaddr == pending_branch->next ? class_cond_not_taken : class_cond_taken]++;
    pending_branch = NULL;
  }
  if (insn->vaddr == begin_address) {
    counting = 1;
    memset(counts, 0, sizeof counts);
    memset(registers, 0, sizeof registers);
    total = 0;
    previous_memory = 0;
  } else if (insn->vaddr == end_address && counting) {
    counting = 0;
    emit_region();
  }
  if (!counting) return;
  ++total;
  if (insn->cls == class_conditional) {
    pending_branch = insn;
  } else if (insn->memory && previous_memory) {
    counts[insn->cls == class_load ? class_load_next : class_store_next]++;
  } else {
    counts[insn->cls]++;
    registers[insn->cls] += (uint64_t)insn->registers;
  }
  previous_memory = insn->memory;
}

static void on_translate(qemu_plugin_id_t id, struct qemu_plugin_tb* tb) {
  (void)id;
  const size_t n = qemu_plugin_tb_n_insns(tb);
  for (size_t i = 0; i < n; ++i) {
    struct qemu_plugin_insn* insn = qemu_plugin_tb_get_insn(tb, i);
    /* one record per translation; QEMU keeps a block's translation while the program runs */
    struct insn_info* info = (struct insn_info*)calloc(1, sizeof *info);
    if (info == NULL) abort();
    info->vaddr = qemu_plugin_insn_vaddr(insn) & ~(uint64_t)1;
    info->next = info->vaddr + qemu_plugin_insn_size(insn);
    char* text = qemu_plugin_insn_disas(insn);
    info->cls = classify(text != NULL ? text : "", &info->memory, &info->registers);
    if (class_dump != NULL) {
      fprintf(class_dump, "%llx %s %s\n", (unsigned long long)info->vaddr,
              info->cls == class_conditional ? "conditional" : class_names[info->cls],
              text != NULL ? text : "");
    }
    free(text); /* allocated by GLib, whose allocator is the C library's */
    qemu_plugin_register_vcpu_insn_exec_cb(insn, on_exec, QEMU_PLUGIN_CB_NO_REGS, info);
  }
}

static void on_qemu_exit(qemu_plugin_id_t id, void* userdata) {
  (void)id;
  (void)userdata;
  if (output != NULL) fclose(output);
  if (class_dump != NULL) fclose(class_dump);
  output = NULL;
  class_dump = NULL;
}

ROTORQ_PLUGIN_EXPORT int qemu_plugin_install(qemu_plugin_id_t id, const struct qemu_info_t* info, int argc,
                                             char** argv) {
  (void)info;
  for (int i = 0; i < argc; ++i) {
    const char* a = argv[i];
    if (strncmp(a, "begin=", 6) == 0) {
      begin_address = strtoull(a + 6, NULL, 16) & ~(uint64_t)1;
    } else if (strncmp(a, "end=", 4) == 0) {
      end_address = strtoull(a + 4, NULL, 16) & ~(uint64_t)1;
    } else if (strcmp(a, "arch=riscv") == 0) {
      arch_riscv = 1;
    } else if (strcmp(a, "arch=arm") == 0) {
      arch_riscv = 0;
    } else if (strncmp(a, "out=", 4) == 0) {
      output = fopen(a + 4, "w");
      if (output == NULL) {
        fprintf(stderr, "rotorq insn plugin: cannot write %s\n", a + 4);
        return -1;
      }
    } else if (strncmp(a, "classes=", 8) == 0) {
      class_dump = fopen(a + 8, "w");
      if (class_dump == NULL) {
        fprintf(stderr, "rotorq insn plugin: cannot write %s\n", a + 8);
        return -1;
      }
    } else {
      fprintf(stderr, "rotorq insn plugin: unknown argument %s\n", a);
      return -1;
    }
  }
  if (begin_address == UINT64_MAX || end_address == UINT64_MAX) {
    fprintf(stderr, "rotorq insn plugin: needs begin=<address>,end=<address>\n");
    return -1;
  }
  qemu_plugin_register_vcpu_tb_trans_cb(id, on_translate);
  qemu_plugin_register_atexit_cb(id, on_qemu_exit, NULL);
  return 0;
}
