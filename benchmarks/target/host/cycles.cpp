// rotorq-cycles: the driver of the cycle and size benchmark (scripts/cycles runs it).
//
// For each core's cross build (benchmarks/target/CMakeLists.txt writes cycles-config.txt there) it
//   1. runs the benchmark firmware (-O2 and -Os) on the core's QEMU machine with the instruction-count
//      plugin (insn_plugin.c), whose begin/end marker addresses it reads from the ELF with nm, and
//      pairs the firmware's region names (printed through semihosting, in order) with the plugin's
//      region counts (in the same order);
//   2. turns the counts into per-call figures: (region - empty region) / calls;
//   3. prices the instruction classes with the core's cost model (cost_models.json): a
//      zero-wait-state cycle estimate;
//   4. measures code and table bytes: each kernel's own size plus every function it calls,
//      transitively, from the disassembly (objdump), and the read-only objects they reference;
//   5. schedules the straight-line kernels with llvm-mca where LLVM has a model of the core;
// then writes every figure as JSON and the tables as Markdown, optionally into the README between
// its markers, and checks a baseline: more than the tolerance (2%) growth in any instruction count
// fails. Everything is deterministic: instruction counts from the emulator and static models.
#include <cxxabi.h>
#include <sys/wait.h>

#include <fmt/core.h>
#include <fmt/format.h>
#include <CLI/CLI.hpp>
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <map>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <regex>
#include <set>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "rotorq/tools/readme_table.hpp"

namespace {

using json = nlohmann::ordered_json;

const char* const readme_begin = "<!-- cycles-table:begin (rotorq-cycles --write-readme) -->";
const char* const readme_end = "<!-- cycles-table:end -->";

// ---- processes and files ------------------------------------------------------------------------

std::string quote(const std::string& s) {
  std::string q = "'";
  for (const char c : s) {
    if (c == '\'') {
      q += "'\\''";
    } else {
      q += c;
    }
  }
  return q + "'";
}

// Runs a shell command, returns its standard output; throws on a non-zero exit status.
std::string run(const std::string& command) {
  std::unique_ptr<FILE, int (*)(FILE*)> pipe(popen(command.c_str(), "r"), pclose);
  if (!pipe) throw std::runtime_error("cannot run: " + command);
  std::string out;
  char buffer[65536];
  size_t n = 0;
  while ((n = fread(buffer, 1, sizeof buffer, pipe.get())) > 0) out.append(buffer, n);
  const int status = pclose(pipe.release());
  if (status == -1 || !WIFEXITED(status) || WEXITSTATUS(status) != 0) {
    throw std::runtime_error(fmt::format("command failed (status {}): {}\n{}", status, command,
                                         out.size() > 2000 ? out.substr(out.size() - 2000) : out));
  }
  return out;
}

std::string read_file(const std::string& path) {
  std::ifstream f(path, std::ios::binary);
  if (!f) throw std::runtime_error("cannot read " + path);
  std::stringstream s;
  s << f.rdbuf();
  return s.str();
}

void write_file(const std::string& path, const std::string& text) {
  std::ofstream f(path, std::ios::binary);
  if (!f) throw std::runtime_error("cannot write " + path);
  f << text;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> lines;
  std::stringstream s(text);
  std::string line;
  while (std::getline(s, line)) lines.push_back(line);
  return lines;
}

std::vector<std::string> split(const std::string& s, char separator) {
  std::vector<std::string> parts;
  std::string part;
  std::stringstream stream(s);
  while (std::getline(stream, part, separator)) parts.push_back(part);
  return parts;
}

std::string demangle(const std::string& name) {
  int status = 0;
  std::unique_ptr<char, void (*)(void*)> d(abi::__cxa_demangle(name.c_str(), nullptr, nullptr, &status),
                                           std::free);
  return status == 0 && d ? std::string(d.get()) : name;
}

// ---- a core's build -------------------------------------------------------------------------------

struct core_build {
  std::string dir;
  std::map<std::string, std::string> values;  // cycles-config.txt
  std::string get(const std::string& key) const {
    const auto it = values.find(key);
    if (it == values.end()) throw std::runtime_error(dir + ": cycles-config.txt has no " + key);
    return it->second;
  }
};

core_build read_build(const std::string& dir) {
  core_build b{dir, {}};
  for (const std::string& line : lines_of(read_file(dir + "/benchmarks/target/cycles-config.txt"))) {
    const auto eq = line.find('=');
    if (eq != std::string::npos) b.values[line.substr(0, eq)] = line.substr(eq + 1);
  }
  return b;
}

// ---- symbols, sections, disassembly ----------------------------------------------------------------

struct symbol {
  uint64_t address = 0;
  uint64_t size = 0;
  char type = '?';
  std::string name;  // mangled
  bool function() const { return type == 't' || type == 'T' || type == 'w' || type == 'W'; }
};

struct section {
  std::string name;
  uint64_t address = 0, size = 0;
  bool read_only_data = false;  // allocated and read-only: constants live here
};

struct instruction {
  uint64_t address = 0;
  std::string mnemonic, operands;  // operands with objdump's comments
};

struct function_code {
  std::string name;
  uint64_t address = 0;
  std::vector<instruction> code;
  std::vector<uint64_t> words;  // literal-pool words (.word)
};

struct image {
  std::vector<symbol> symbols;
  std::vector<section> sections;
  std::map<uint64_t, function_code> functions;  // by start address
  std::map<std::string, uint64_t> function_by_name;
  std::map<std::string, size_t> symbol_by_name;
  std::map<uint64_t, uint64_t> function_sizes;  // start address -> size
  std::vector<symbol> tables;                   // read-only data objects
  const symbol* find(const std::string& name) const {
    const auto it = symbol_by_name.find(name);
    return it == symbol_by_name.end() ? nullptr : &symbols[it->second];
  }
};

image read_image(const core_build& b, const std::string& elf) {
  image im;
  static const std::regex nm_line(R"(^([0-9a-f]+) (?:([0-9a-f]+) )?(\S) (\S+)$)");
  for (const std::string& line : lines_of(run(quote(b.get("nm")) + " -S --defined-only " + quote(elf)))) {
    std::smatch m;
    if (!std::regex_match(line, m, nm_line)) continue;
    symbol s;
    s.address = std::stoull(m[1], nullptr, 16) & ~uint64_t{1};
    s.size = m[2].matched ? std::stoull(m[2], nullptr, 16) : 0;
    s.type = m[3].str()[0];
    s.name = m[4];
    im.symbols.push_back(s);
  }
  // Sections: "  1 .text  00008e5c  00000040 ..." and their flags on the next line.
  static const std::regex section_line(R"(^\s*\d+\s+(\S+)\s+([0-9a-f]+)\s+([0-9a-f]+)\s.*$)");
  const std::vector<std::string> h = lines_of(run(quote(b.get("objdump")) + " -h " + quote(elf)));
  for (size_t i = 0; i + 1 < h.size(); ++i) {
    std::smatch m;
    if (!std::regex_match(h[i], m, section_line)) continue;
    section s;
    s.name = m[1];
    s.size = std::stoull(m[2], nullptr, 16);
    s.address = std::stoull(m[3], nullptr, 16);
    const std::string& flags = h[i + 1];
    s.read_only_data =
        flags.find("ALLOC") != std::string::npos && flags.find("READONLY") != std::string::npos;
    im.sections.push_back(s);
  }
  for (size_t i = 0; i < im.symbols.size(); ++i) {
    const symbol& s = im.symbols[i];
    im.symbol_by_name.emplace(s.name, i);
    if (s.function()) {
      uint64_t& size = im.function_sizes[s.address];
      size = std::max(size, s.size);
    } else if (s.size != 0) {
      for (const section& sec : im.sections) {
        if (sec.read_only_data && s.address >= sec.address && s.address < sec.address + sec.size) {
          im.tables.push_back(s);
          break;
        }
      }
    }
  }
  static const std::regex header(R"(^([0-9a-f]+) <(.+)>:$)");
  static const std::regex insn_line(R"(^\s*([0-9a-f]+):\s+(\S+)\s*(.*)$)");
  function_code* current = nullptr;
  for (const std::string& line :
       lines_of(run(quote(b.get("objdump")) + " -d --no-show-raw-insn " + quote(elf)))) {
    std::smatch m;
    if (std::regex_match(line, m, header)) {
      // objdump also lists the constants that share the code's section: only nm's functions count
      const uint64_t address = std::stoull(m[1], nullptr, 16);
      const symbol* s = im.find(m[2]);
      if (s == nullptr || !s->function()) {
        current = nullptr;
        continue;
      }
      current = &im.functions[address];
      current->name = m[2];
      current->address = address;
      im.function_by_name[current->name] = address;
    } else if (current != nullptr && std::regex_match(line, m, insn_line)) {
      const std::string mnemonic = m[2];
      if (mnemonic == ".word") {
        current->words.push_back(std::stoull(m[3].str().substr(0, 10), nullptr, 16));
      } else if (mnemonic[0] != '.') {
        current->code.push_back({std::stoull(m[1], nullptr, 16), mnemonic, m[3]});
      }
    }
  }
  return im;
}

// The read-only object that holds an address, if any.
const symbol* table_at(const image& im, uint64_t address) {
  for (const symbol& s : im.tables) {
    if (address >= s.address && address < s.address + s.size) return &s;
  }
  return nullptr;
}

// Branches, calls and jumps of either architecture (by mnemonic; conditions and widths included).
bool is_branch(const instruction& insn) {
  const std::string m = insn.mnemonic.substr(0, insn.mnemonic.find('.'));
  static const std::set<std::string> names = {"b",    "bl",   "blx",  "bx",   "cbz",  "cbnz", "j",
                                              "jal",  "jr",   "jalr", "call", "tail", "beq",  "bne",
                                              "blt",  "bge",  "bltu", "bgeu", "beqz", "bnez", "blez",
                                              "bgez", "bltz", "bgtz", "bgt",  "ble",  "bgtu", "bleu"};
  if (names.count(m) != 0) return true;
  static const std::set<std::string> conditions = {"eq", "ne", "cs", "hs", "cc", "lo", "mi", "pl",
                                                   "vs", "vc", "hi", "ls", "ge", "lt", "gt", "le"};
  return m.size() == 3 && m[0] == 'b' && conditions.count(m.substr(1)) != 0;
}

struct footprint {
  uint64_t code = 0, tables = 0;
  std::vector<std::string> functions;  // demangled, the kernel first
  std::vector<std::string> table_names;
};

// What one function pulls in: itself, every function it calls or jumps to,
// transitively, and the read-only objects any of them references.
footprint footprint_of(const image& im, uint64_t start) {
  static const std::regex annotation(R"(<([^<>+]+)>\s*$)");
  static const std::regex movw(R"(^(r\d+|ip|lr|sl|fp|sb), #(\d+))");
  std::set<uint64_t> seen_functions;
  std::set<uint64_t> seen_tables;
  std::vector<uint64_t> work{start};
  footprint f;
  while (!work.empty()) {
    const uint64_t address = work.back();
    work.pop_back();
    if (!seen_functions.insert(address).second) continue;
    const auto it = im.functions.find(address);
    if (it == im.functions.end()) continue;
    const function_code& fn = it->second;
    const auto size = im.function_sizes.find(address);
    f.code += size == im.function_sizes.end() ? 0 : size->second;
    f.functions.push_back(demangle(fn.name));
    // A constant that is a table's start address: a table reference. (Only the start: code starts
    // at 0 on some of the machines, so small constants would match addresses inside objects.)
    const auto refer = [&](uint64_t target) {
      const symbol* t = table_at(im, target);
      if (t != nullptr && t->address == target && seen_tables.insert(t->address).second) {
        f.tables += t->size;
        f.table_names.push_back(fmt::format("{} ({} bytes)", demangle(t->name), t->size));
      }
    };
    std::map<std::string, uint64_t> movw_values;
    for (const instruction& insn : fn.code) {
      std::smatch m;
      if (std::regex_search(insn.operands, m, annotation)) {
        // a branch or call names its target; other instructions' annotations are objdump's guesses
        // at an address (right for a constant's address, wrong for a register-relative store), so
        // only read-only objects are taken from them
        const auto byname = im.function_by_name.find(m[1]);
        if (byname != im.function_by_name.end()) {
          if (byname->second != address && is_branch(insn)) work.push_back(byname->second);
        } else if (const symbol* s = im.find(m[1]); s != nullptr && table_at(im, s->address) != nullptr) {
          refer(s->address);
        }
      }
      // movw/movt pairs (Armv7-M) build an address in two halves
      if (std::regex_search(insn.operands, m, movw)) {
        const uint64_t value = std::stoull(m[2]);
        if (insn.mnemonic.rfind("movw", 0) == 0) {
          movw_values[m[1]] = value;
        } else if (insn.mnemonic.rfind("movt", 0) == 0 && movw_values.count(m[1]) != 0) {
          refer((value << 16) | movw_values[m[1]]);
        }
      }
    }
    for (const uint64_t word : fn.words) refer(word);
  }
  return f;
}

// ---- running the firmware ---------------------------------------------------------------------------

struct region {
  std::string function, format;
  unsigned calls = 0;
  uint64_t kernel = 0;
  uint64_t instructions = 0;
  std::map<std::string, double> classes;  // class -> count, and "<class>.words" -> words
  std::optional<uint64_t> counter;        // the firmware's cycle-counter reading (hardware counter builds)
};

std::vector<region> run_firmware(const core_build& b, const std::string& elf, const image& im,
                                 const std::string& work_dir) {
  const symbol* begin = im.find("rotorq_cycles_begin");
  const symbol* end = im.find("rotorq_cycles_end");
  if (begin == nullptr || end == nullptr) throw std::runtime_error(elf + ": no rotorq_cycles_begin/end");
  const std::string counts_path = work_dir + "/" + b.get("core") + "-regions.txt";
  std::string command;
  for (const std::string& part : split(b.get("emulator"), '|')) command += quote(part) + " ";
  command += quote(elf);
  command += " -plugin " + quote(fmt::format("{},begin={:x},end={:x},arch={},out={}", b.get("plugin"),
                                             begin->address, end->address, b.get("arch"), counts_path));
  const std::string output = run("timeout 120 " + command + " 2>&1");

  std::vector<region> regions;
  static const std::regex region_line(R"(^rotorq-cycles region (\d+) (\S+) (\S+) (\d+) ([0-9a-f]+)\r?$)");
  static const std::regex counter_line(R"(^rotorq-cycles counter (\d+) \S+ \S+ (\d+)\r?$)");
  bool done = false;
  for (const std::string& line : lines_of(output)) {
    std::smatch m;
    if (std::regex_match(line, m, region_line)) {
      if (std::stoul(m[1]) != regions.size()) throw std::runtime_error(elf + ": regions out of order");
      region r;
      r.function = m[2];
      r.format = m[3];
      r.calls = static_cast<unsigned>(std::stoul(m[4]));
      r.kernel = std::stoull(m[5], nullptr, 16) & ~uint64_t{1};
      regions.push_back(r);
    } else if (std::regex_match(line, m, counter_line)) {
      const size_t k = std::stoul(m[1]);
      if (k < regions.size()) regions[k].counter = std::stoull(m[2]);
    } else if (line.rfind("rotorq-cycles done", 0) == 0) {
      done = true;
    }
  }
  if (!done) throw std::runtime_error(elf + ": the firmware did not finish:\n" + output);

  static const std::regex count_line(R"(^region (\d+) insns (\d+)(.*)$)");
  size_t k = 0;
  for (const std::string& line : lines_of(read_file(counts_path))) {
    std::smatch m;
    if (!std::regex_match(line, m, count_line)) continue;
    if (k >= regions.size() || std::stoul(m[1]) != k)
      throw std::runtime_error(elf + ": plugin regions do not pair");
    regions[k].instructions = std::stoull(m[2]);
    std::stringstream fields(m[3]);
    std::string field;
    while (fields >> field) {
      const auto eq = field.find('=');
      regions[k].classes[field.substr(0, eq)] = std::stod(field.substr(eq + 1));
    }
    ++k;
  }
  if (k != regions.size()) {
    throw std::runtime_error(fmt::format("{}: {} regions named, {} counted", elf, regions.size(), k));
  }
  if (regions.empty() || regions[0].function != "empty")
    throw std::runtime_error(elf + ": no empty region first");
  return regions;
}

// ---- cost model -------------------------------------------------------------------------------------

// Cycles of a set of class counts; every class that occurs must be priced.
double price(const json& model, const std::map<std::string, double>& classes, const std::string& where) {
  const json& costs = model.at("costs");
  double cycles = 0;
  for (const auto& [name, count] : classes) {
    if (name.find(".words") != std::string::npos) continue;
    if (!costs.contains(name)) {
      if (count != 0) throw std::runtime_error(where + ": the cost model has no price for class " + name);
      continue;
    }
    const json& c = costs.at(name);
    if (c.is_number()) {
      cycles += count * c.get<double>();
    } else {
      const auto words = classes.find(name + ".words");
      cycles += count * c.at("per_instruction").get<double>() +
                (words == classes.end() ? 0.0 : words->second) * c.at("per_word").get<double>();
    }
  }
  return cycles;
}

// ---- llvm-mca -----------------------------------------------------------------------------------------

const std::set<std::string> arm_conditions = {"eq", "ne", "cs", "hs", "cc", "lo", "mi", "pl",
                                              "vs", "vc", "hi", "ls", "ge", "lt", "gt", "le"};

bool is_arm_branch(const instruction& insn) {
  std::string m = insn.mnemonic.substr(0, insn.mnemonic.find('.'));
  if (m == "b" || m == "bl" || m == "blx" || m == "bx" || m == "cbz" || m == "cbnz" || m == "tbb" ||
      m == "tbh")
    return true;
  if (m.size() == 3 && m[0] == 'b' && arm_conditions.count(m.substr(1)) != 0) return true;
  if ((m.rfind("pop", 0) == 0 || m.rfind("ldm", 0) == 0) && insn.operands.find("pc") != std::string::npos)
    return true;
  return false;
}

// The kernel's instructions as assembly for llvm-mca, if it is straight-line code (no branch but its
// final return). For the Cortex-M7 model, which has no entry for IT, the IT instructions are left
// out and the instructions they predicate are scheduled as unconditional.
//
// Two rewrites keep LLVM 14 from failing on objdump's spelling, neither changes the schedule's
// resources: a post-indexed "ldr.w rX, [sp], #4" becomes "pop {rX}" (the same operation, on which
// llvm-mca-14 does not crash), and a floating-point immediate that objdump prints as "#0" with the
// value in its comment is written as that value.
std::optional<std::string> straight_line(const function_code& fn, bool drop_it) {
  std::vector<instruction> code = fn.code;
  while (!code.empty() && code.back().mnemonic.rfind("nop", 0) == 0) code.pop_back();  // alignment
  if (code.empty()) return std::nullopt;
  for (size_t i = 0; i + 1 < code.size(); ++i) {
    if (is_arm_branch(code[i])) return std::nullopt;
  }
  if (!is_arm_branch(code.back())) return std::nullopt;
  static const std::regex post_indexed_pop(R"(^(\w+), \[sp\], #4$)");
  static const std::regex vmov_immediate(R"(^(\w+), #[-0-9.]+\s*@\s*0x[0-9a-f]+\s+(\S+)\s*$)");
  std::string text = ".syntax unified\n.thumb\n";
  int predicated = 0;
  for (const instruction& insn : code) {
    std::smatch m;
    std::string operands = insn.operands;
    if (insn.mnemonic.rfind("vmov", 0) == 0 && std::regex_match(operands, m, vmov_immediate)) {
      operands = m[1].str() + ", #" + m[2].str();
    }
    operands = operands.substr(0, operands.find('@'));
    operands = operands.substr(0, operands.find('<'));
    while (!operands.empty() && (operands.back() == ' ' || operands.back() == '\t')) operands.pop_back();
    std::string mnemonic = insn.mnemonic;
    if (mnemonic.rfind("ldr", 0) == 0 && std::regex_match(operands, m, post_indexed_pop)) {
      mnemonic = "pop";
      operands = "{" + m[1].str() + "}";
    }
    if (mnemonic.rfind("it", 0) == 0 && mnemonic.size() <= 5) {
      if (drop_it) {
        predicated = static_cast<int>(mnemonic.size()) - 1;  // it, itt, ittt, itttt
        continue;
      }
    } else if (predicated > 0) {
      --predicated;
      const auto dot = mnemonic.find('.');
      std::string base = mnemonic.substr(0, dot);
      const std::string suffix = dot == std::string::npos ? "" : mnemonic.substr(dot);
      if (base.size() > 2 && arm_conditions.count(base.substr(base.size() - 2)) != 0) {
        base = base.substr(0, base.size() - 2);
      }
      mnemonic = base + suffix;
    }
    text += "\t" + mnemonic + " " + operands + "\n";
  }
  return text;
}

// llvm-mca's total cycles for `iterations` back-to-back passes of the kernel.
std::optional<double> mca_cycles(const std::string& mca, const std::string& cpu, const std::string& path,
                                 int iterations, std::string& error) {
  try {
    const std::string out = run(quote(mca) + " -mtriple=thumbv7em-none-eabi -mcpu=" + cpu +
                                " -iterations=" + std::to_string(iterations) + " " + quote(path) + " 2>&1");
    static const std::regex total(R"(Total Cycles:\s+(\d+))");
    std::smatch m;
    if (std::regex_search(out, m, total)) return std::stod(m[1]);
    error = "no Total Cycles in llvm-mca's output";
  } catch (const std::exception& e) {
    error = e.what();
  }
  return std::nullopt;
}

// ---- measuring one core --------------------------------------------------------------------------------

// llvm-mca's scheduling models: the CPU name for the cores LLVM 14 models (cortex-m33 uses its
// Cortex-M4 model; the M0+ has none).
std::optional<std::string> mca_cpu(const std::string& core) {
  if (core == "cortex-m4" || core == "cortex-m7" || core == "cortex-m33") return core;
  return std::nullopt;
}

json measure_core(const core_build& b, const json& models, const std::string& mca,
                  const std::string& work_dir) {
  const std::string core = b.get("core");
  if (!models.at("models").contains(core)) throw std::runtime_error("no cost model for " + core);
  const json& model = models.at("models").at(core);
  json result;
  result["core"] = core;
  result["name"] = model.at("name");
  result["port"] = b.get("port");
  result["compiler"] = b.get("compiler");
  result["cost_model"] = {{"source", model.at("source")}, {"assumptions", model.at("assumptions")}};
  std::map<std::string, json> functions;  // "<function>/<format>" -> entry
  std::vector<std::string> order;
  for (const std::string level : {"O2", "Os"}) {
    const std::string elf = b.get("elf_" + level);
    const image im = read_image(b, elf);
    const std::vector<region> regions = run_firmware(b, elf, im, work_dir);
    const region& empty = regions[0];
    const double empty_cycles = price(model, empty.classes, core + " empty");
    result["empty_region"][level] = {{"instructions", empty.instructions}, {"calls", empty.calls}};
    for (size_t k = 1; k < regions.size(); ++k) {
      const region& r = regions[k];
      const std::string key = r.function + "/" + r.format;
      const double calls = r.calls;
      json figures;
      figures["instructions"] =
          (static_cast<double>(r.instructions) - static_cast<double>(empty.instructions)) / calls;
      figures["cycles"] = (price(model, r.classes, core + " " + key) - empty_cycles) / calls;
      json classes = json::object();
      std::set<std::string> names;
      for (const auto& entry : r.classes) names.insert(entry.first);
      for (const auto& entry : empty.classes) names.insert(entry.first);
      for (const std::string& name : names) {
        const double here = r.classes.count(name) != 0 ? r.classes.at(name) : 0.0;
        const double base = empty.classes.count(name) != 0 ? empty.classes.at(name) : 0.0;
        if (here != base) classes[name] = (here - base) / calls;
      }
      figures["classes"] = classes;
      const footprint fp = footprint_of(im, r.kernel);
      figures["code_bytes"] = fp.code;
      figures["table_bytes"] = fp.tables;
      figures["functions"] = fp.functions;
      figures["tables"] = fp.table_names;
      if (r.counter && empty.counter) {
        figures["counter_cycles"] =
            (static_cast<double>(*r.counter) - static_cast<double>(*empty.counter)) / calls;
      }
      if (level == "O2") {
        if (const auto cpu = mca_cpu(core); cpu && !mca.empty()) {
          const auto fn = im.functions.find(r.kernel);
          if (fn != im.functions.end()) {
            if (const auto assembly = straight_line(fn->second, core == "cortex-m7")) {
              std::string error;
              const std::string path = work_dir + "/" + core + "-" + r.function + "-" + r.format + ".s";
              write_file(path, *assembly);
              const auto once = mca_cycles(mca, *cpu, path, 1, error);
              const auto hundred = mca_cycles(mca, *cpu, path, 100, error);
              if (once && hundred) {
                figures["llvm_mca_cycles"] = *once;
                figures["llvm_mca_cycles_repeated"] = *hundred / 100.0;
              } else {
                figures["llvm_mca_error"] = error;
              }
            }
          }
        }
      }
      if (functions.count(key) == 0) {
        order.push_back(key);
        functions[key] = {{"function", r.function}, {"format", r.format}};
      }
      functions[key][level] = figures;
    }
  }
  result["functions"] = json::array();
  for (const std::string& key : order) result["functions"].push_back(functions[key]);
  return result;
}

// ---- tables --------------------------------------------------------------------------------------------

const json* find_function(const json& core, const std::string& function, const std::string& format) {
  for (const json& f : core.at("functions")) {
    if (f.at("function") == function && f.at("format") == format) return &f;
  }
  return nullptr;
}

std::string number(double v) {
  if (std::fabs(v) >= 100) return fmt::format("{:.0f}", v);
  return fmt::format("{:.1f}", v);
}

struct target {
  std::string text, core, function, format;
  double limit;
  bool ratio;  // float chain cycles / fixed chain cycles >= limit
};

const std::vector<target> targets = {
    {"Cortex-M4F q31 full chain <= 100 cycles", "cortex-m4", "chain", "q31", 100, false},
    {"Cortex-M4F q31 Park <= 20 cycles", "cortex-m4", "park", "q31", 20, false},
    {"Cortex-M4F q31 sin_cos <= 30 cycles", "cortex-m4", "sin_cos", "q31", 30, false},
    {"Cortex-M0+ q15 full chain <= 250 cycles", "cortex-m0plus", "chain", "q15", 250, false},
    {"Cortex-M4F: float + libm chain >= 3x the q31 chain", "cortex-m4", "chain", "q31", 3, true},
    {"Cortex-M4F: float + libm chain >= 3x the q15 chain", "cortex-m4", "chain", "q15", 3, true},
    {"Cortex-M0+: float + libm chain >= 10x the q15 chain", "cortex-m0plus", "chain", "q15", 10, true},
};

json evaluate_targets(const json& results) {
  json out = json::array();
  for (const target& t : targets) {
    const json* core = nullptr;
    for (const json& c : results.at("cores")) {
      if (c.at("core") == t.core) core = &c;
    }
    if (core == nullptr) continue;
    const json* f = find_function(*core, t.function, t.format);
    const json* fl = find_function(*core, t.function, "float");
    if (f == nullptr || (t.ratio && fl == nullptr)) continue;
    const double fixed_cycles = f->at("O2").at("cycles").get<double>();
    json e{{"target", t.text},
           {"core", t.core},
           {"function", t.function},
           {"format", t.format},
           {"limit", t.limit}};
    if (t.ratio) {
      const double ratio = fl->at("O2").at("cycles").get<double>() / fixed_cycles;
      e["measured"] = ratio;
      e["met"] = ratio >= t.limit;
      e["status"] = ratio >= t.limit ? fmt::format("met: {:.2f}x", ratio)
                                     : fmt::format("missed: {:.2f}x, {:.0f}% short", ratio,
                                                   100.0 * (1.0 - ratio / t.limit));
    } else {
      e["measured"] = fixed_cycles;
      e["met"] = fixed_cycles <= t.limit;
      e["status"] = fixed_cycles <= t.limit
                        ? fmt::format("met: {:.0f} cycles", fixed_cycles)
                        : fmt::format("missed: {:.0f} cycles, {:.0f} over ({:.1f}x the target)", fixed_cycles,
                                      fixed_cycles - t.limit, fixed_cycles / t.limit);
    }
    out.push_back(e);
  }
  return out;
}

const std::vector<std::pair<std::string, std::string>> function_rows = {
    {"add", "`a + b`"},
    {"subtract", "`a - b`"},
    {"multiply", "`a * b`"},
    {"mul_add", "`mul_add`"},
    {"accumulator", "`accumulator` mac + msc + add + result"},
    {"sin_cos", "`sin_cos`"},
    {"clarke", "`clarke`"},
    {"clarke_balanced", "`clarke_balanced`"},
    {"clarke_power_invariant", "`clarke_power_invariant`"},
    {"inverse_clarke", "`inverse_clarke`"},
    {"inverse_clarke_power_invariant", "`inverse_clarke_power_invariant`"},
    {"park", "`park`"},
    {"inverse_park", "`inverse_park`"},
    {"svpwm_circle", "`svpwm` (circle)"},
    {"svpwm_hexagon", "`svpwm` (hexagon)"},
    {"sine_pwm", "`sine_pwm`"},
    {"six_step", "`six_step`"},
    {"limit_magnitude", "`limit_magnitude`"},
    {"limit_d_priority", "`limit_d_priority`"},
    {"bus_update", "`bus_normalizer::update`"},
    {"bus_normalize", "`bus_normalizer::normalize`"},
    {"duty_to_compare", "`duty_to_compare`"},
    {"pi_regulator", "`pi_regulator::update`"},
    {"chain", "**chain**, inlined"},
    {"decode_hall", "`decode_hall`"},
    {"glitch_filter", "`hall_glitch_filter::update`"},
    {"hall_tracker", "`hall_tracker` update + estimate"},
    {"interpolator_update", "`angle_interpolator::update`"},
    {"interpolator_estimate", "`angle_interpolator::estimate`"},
    {"speed_from_motion", "`speed_from_motion`"},
    {"rpm_q8", "`rpm_scale::rpm_q8`"},
    {"commutation", "`six_step_commutation` + `commutation_voltage`"},
    {"foc_handover", "`foc_handover::update`"},
};

// A row's name: the label and the format; a function of integers only ("-") has no format.
std::string row_name(const std::string& label, const std::string& format) {
  return format == "-" ? label : label + " " + format;
}

std::string short_name(const json& core) {
  std::string n = core.at("name");
  return n;
}

std::string markdown(const json& results) {
  const json& cores = results.at("cores");
  std::string md;
  std::string compilers;
  std::set<std::string> seen;
  for (const json& c : cores) {
    if (seen.insert(c.at("compiler").get<std::string>()).second) {
      compilers += (compilers.empty() ? "" : ", ") + c.at("compiler").get<std::string>();
    }
  }
  md += fmt::format(
      "Per call, averaged over {} varied inputs, built -O2 with the project's toolchain files ({}). Each "
      "cell is "
      "**executed instructions / estimated cycles**: instruction counts from QEMU, cycles from the per-class "
      "cost "
      "model of each core (`benchmarks/target/cost_models.json`, sources below), **zero-wait-state "
      "estimates**, not "
      "measurements. Cortex-M7 and M33 cycles are upper estimates (dual issue not modelled).\n\n",
      results.at("calls_per_region").get<int>(), compilers);

  std::vector<const json*> all_cores;
  for (const json& c : cores) all_cores.push_back(&c);
  // A table's heading: the first column, one column per core, and an optional last text column.
  const auto header = [](const std::string& first, const std::vector<const json*>& columns,
                         const std::string& last = "") {
    std::string h = "| " + first + " |";
    std::string rule = "|---|";
    for (const json* c : columns) {
      h += " " + short_name(*c) + " |";
      rule += "---:|";
    }
    if (!last.empty()) {
      h += " " + last + " |";
      rule += "---|";
    }
    return h + "\n" + rule + "\n";
  };
  const auto cell = [](const json* f, const std::string& level) -> std::string {
    if (f == nullptr || !f->contains(level)) return "-";
    const json& x = f->at(level);
    return number(x.at("instructions").get<double>()) + " / " + number(x.at("cycles").get<double>());
  };

  md += header("function (format)", all_cores);
  for (const auto& [function, label] : function_rows) {
    for (const std::string format : {"q15", "q31", "t16", "t32", "-"}) {
      bool any = false;
      std::string row = "| " + row_name(label, format) + " |";
      for (const json& c : cores) {
        const json* f = find_function(c, function, format);
        any = any || f != nullptr;
        row += " " + cell(f, "O2") + " |";
      }
      if (any) md += row + "\n";
    }
  }

  md +=
      "\nThe float baseline (single precision, `sinf`/`cosf` from picolibc's libm; hardware FPU on the M4F, "
      "M7 and "
      "M33, soft float elsewhere): float instructions / cycles, and how many times the fixed-point cycles "
      "that is "
      "(float cycles / q15 cycles, float cycles / q31 cycles; one ratio for a function of integers "
      "only).\n\n";
  md += header("function, float", all_cores);
  for (const auto& [function, label] : function_rows) {
    bool any = false;
    std::string row = "| " + label + " |";
    for (const json& c : cores) {
      const json* fl = find_function(c, function, "float");
      if (fl == nullptr) {
        row += " - |";
        continue;
      }
      any = true;
      const double fc = fl->at("O2").at("cycles").get<double>();
      std::string ratios;
      for (const std::string format : {"q15", "q31", "-"}) {
        const json* f = find_function(c, function, format);
        if (f == nullptr) continue;
        ratios += (ratios.empty() ? "" : " / ") +
                  fmt::format("{:.1f}x", fc / f->at("O2").at("cycles").get<double>());
      }
      row += " " + cell(fl, "O2") + " (" + ratios + ") |";
    }
    if (any) md += row + "\n";
  }

  md +=
      "\nCode bytes per function at -O2 / -Os: the wrapper with the library code inlined into it, plus every "
      "function it calls (run-time helpers, libm), each counted once; the read-only tables they use are "
      "counted "
      "apart (the last column: those of the first core that has any; rotorq's are the same on every "
      "core).\n\n";
  md += header("function (format)", all_cores, "tables");
  for (const auto& [function, label] : function_rows) {
    for (const std::string format : {"q15", "q31", "t16", "t32", "-", "float"}) {
      bool any = false;
      std::string row = "| " + row_name(label, format) + " |";
      std::string tables = "-";
      for (const json& c : cores) {
        const json* f = find_function(c, function, format);
        if (f == nullptr) {
          row += " - |";
          continue;
        }
        any = true;
        row += fmt::format(" {} / {} |", f->at("O2").at("code_bytes").get<uint64_t>(),
                           f->at("Os").at("code_bytes").get<uint64_t>());
        if (tables == "-" && f->at("O2").at("table_bytes").get<uint64_t>() != 0) {
          std::string names;
          for (const json& n : f->at("O2").at("tables")) {
            std::string name = n.get<std::string>();
            if (name.rfind("rotorq::detail::", 0) == 0) name = name.substr(16);
            names += (names.empty() ? "" : ", ") + name;
          }
          tables = names + (c.at("core") == cores.front().at("core") ? "" : " (" + short_name(c) + ")");
        }
      }
      if (any) md += row + " " + tables + " |\n";
    }
  }

  md +=
      "\nCross-check on the straight-line kernels (no branch but the return): **cost model / llvm-mca one "
      "pass / "
      "llvm-mca per pass of 100 back to back**, cycles of the same -O2 instructions. One pass includes the "
      "pipeline's fill and the last result's latency; back to back, passes overlap. LLVM 14 schedules the "
      "Cortex-M33 with its Cortex-M4 model and has no Cortex-M0+ model.\n\n";
  {
    std::vector<const json*> mca_cores;
    for (const json& c : cores) {
      if (mca_cpu(c.at("core"))) mca_cores.push_back(&c);
    }
    md += header("function (format)", mca_cores);
    for (const auto& [function, label] : function_rows) {
      for (const std::string format : {"q15", "q31", "t16", "t32", "-", "float"}) {
        bool any = false;
        std::string row = "| " + row_name(label, format) + " |";
        for (const json* c : mca_cores) {
          const json* f = find_function(*c, function, format);
          if (f == nullptr || !f->at("O2").contains("llvm_mca_cycles")) {
            row += " - |";
            continue;
          }
          any = true;
          row += fmt::format(" {} / {:.0f} / {} |", number(f->at("O2").at("cycles").get<double>()),
                             f->at("O2").at("llvm_mca_cycles").get<double>(),
                             number(f->at("O2").at("llvm_mca_cycles_repeated").get<double>()));
        }
        if (any) md += row + "\n";
      }
    }
  }

  md +=
      "\nThe cycle targets set for the library (estimated cycles, -O2):\n\n| target | result |\n|---|---|\n";
  for (const json& t : results.at("targets")) {
    md += fmt::format("| {} | {} |\n", t.at("target").get<std::string>(), t.at("status").get<std::string>());
  }

  md += "\nCost models (each core's assumptions are in `benchmarks/target/results/cycles.json`):\n\n";
  for (const json& c : cores) {
    md += fmt::format("- {}: {}.\n", short_name(c), c.at("cost_model").at("source").get<std::string>());
  }
  return md;
}

// ---- the README and the baseline ----------------------------------------------------------------------

std::string replace_readme_table(const std::string& readme, const std::string& table) {
  const std::optional<std::string> updated =
      rotorq::tools::with_table(readme, readme_begin, readme_end, table);
  if (!updated) {
    throw std::runtime_error(std::string("the README has no ") + readme_begin + " ... " + readme_end +
                             " markers");
  }
  return *updated;
}

json baseline_of(const json& results) {
  json b;
  b["about"] =
      "Executed instructions per call (-O2 and -Os) of every benchmark function on every core; `bash "
      "scripts/cycles "
      "--check` fails when one grows by more than the tolerance. `bash scripts/cycles --update-baseline` "
      "rewrites it.";
  b["tolerance"] = 0.02;
  b["cores"] = json::object();
  for (const json& c : results.at("cores")) {
    json& entry = b["cores"][c.at("core").get<std::string>()];
    entry = json::object();
    for (const json& f : c.at("functions")) {
      const std::string key = f.at("function").get<std::string>() + "/" + f.at("format").get<std::string>();
      entry[key] = {{"O2", std::round(f.at("O2").at("instructions").get<double>() * 1000) / 1000},
                    {"Os", std::round(f.at("Os").at("instructions").get<double>() * 1000) / 1000}};
    }
  }
  return b;
}

// Every function/core/level whose instruction count grew by more than the tolerance; also entries
// the baseline has and the results lack.
std::vector<std::string> regressions(const json& baseline, const json& results) {
  std::vector<std::string> problems;
  const double tolerance = baseline.value("tolerance", 0.02);
  const json now = baseline_of(results);
  for (const auto& [core, functions] : baseline.at("cores").items()) {
    if (!now.at("cores").contains(core)) continue;  // that core was not measured this time
    const json& current = now.at("cores").at(core);
    for (const auto& [key, levels] : functions.items()) {
      if (!current.contains(key)) {
        problems.push_back(fmt::format("{} {}: in the baseline, not measured", core, key));
        continue;
      }
      for (const std::string level : {"O2", "Os"}) {
        const double before = levels.at(level).get<double>();
        const double after = current.at(key).at(level).get<double>();
        if (after > before * (1.0 + tolerance) + 1e-9) {
          problems.push_back(fmt::format("{} {} -{}: {:.2f} -> {:.2f} instructions per call (+{:.1f}%)", core,
                                         key, level, before, after, 100.0 * (after / before - 1.0)));
        }
      }
    }
  }
  return problems;
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{"rotorq-cycles: instruction counts, cycle estimates and sizes per function per core"};
  std::vector<std::string> builds;
  std::string costs, json_path, markdown_path, readme, check_readme, baseline, write_baseline, work_dir = ".";
  std::string mca = "llvm-mca-14";
  app.add_option("--build", builds,
                 "a core's cross build directory (configured with ROTORQ_BUILD_CYCLE_BENCHMARKS)")
      ->required();
  app.add_option("--costs", costs, "the cost models (benchmarks/target/cost_models.json)")->required();
  app.add_option("--json", json_path, "write every figure here");
  app.add_option("--markdown", markdown_path, "write the tables here");
  app.add_option("--write-readme", readme, "replace the README's cycles table with a fresh one");
  app.add_option("--check-readme", check_readme,
                 "fail when the README's cycles table differs from a fresh one");
  app.add_option("--check-baseline", baseline,
                 "fail when an instruction count grew beyond the baseline's tolerance");
  app.add_option("--write-baseline", write_baseline, "write the instruction counts as the new baseline");
  app.add_option("--llvm-mca", mca, "llvm-mca program (empty: skip the cross-check)");
  app.add_option("--work", work_dir, "directory for temporary files");
  CLI11_PARSE(app, argc, argv);

  try {
    const json models = json::parse(read_file(costs));
    json results;
    results["generator"] = "rotorq-cycles (benchmarks/target)";
    results["about"] =
        "Per call: (instructions of a region - those of the empty region) / calls. cycles: the core's cost "
        "model "
        "applied to the executed instruction classes, a zero-wait-state estimate. code_bytes: the kernel and "
        "every "
        "function it calls; table_bytes: the read-only objects they reference. llvm_mca_cycles: llvm-mca's "
        "schedule "
        "of a straight-line kernel, one pass. counter_cycles: the core's cycle counter (only in builds with "
        "ROTORQ_CYCLES_HW_COUNTER; QEMU's readings are not cycles).";
    results["calls_per_region"] = 0;
    results["cores"] = json::array();
    for (const std::string& dir : builds) {
      const core_build b = read_build(dir);
      const json core = measure_core(b, models, mca, work_dir);
      results["calls_per_region"] = core.at("empty_region").at("O2").at("calls");
      results["cores"].push_back(core);
      fmt::print("rotorq-cycles: {} measured\n", b.get("core"));
    }
    results["targets"] = evaluate_targets(results);
    const std::string table = markdown(results);
    if (!json_path.empty()) write_file(json_path, results.dump(1) + "\n");
    if (!markdown_path.empty()) write_file(markdown_path, table);
    if (!readme.empty()) write_file(readme, replace_readme_table(read_file(readme), table));
    if (!write_baseline.empty()) write_file(write_baseline, baseline_of(results).dump(1) + "\n");

    int status = 0;
    if (!baseline.empty()) {
      const std::vector<std::string> problems = regressions(json::parse(read_file(baseline)), results);
      for (const std::string& p : problems) fmt::print(stderr, "rotorq-cycles: regression: {}\n", p);
      if (!problems.empty()) {
        fmt::print(
            stderr,
            "rotorq-cycles: {} instruction counts grew by more than the baseline's tolerance; if the change "
            "is intended, run bash scripts/cycles --update-baseline and commit the baseline\n",
            problems.size());
        status = 1;
      } else {
        fmt::print("rotorq-cycles: no instruction count grew beyond the baseline's tolerance\n");
      }
    }
    if (!check_readme.empty()) {
      const std::string current = read_file(check_readme);
      if (replace_readme_table(current, table) != current) {
        fmt::print(stderr,
                   "rotorq-cycles: the README's cycles table is out of date: run bash scripts/cycles\n");
        status = 1;
      } else {
        fmt::print("rotorq-cycles: the README's cycles table is current\n");
      }
    }
    return status;
  } catch (const std::exception& e) {
    fmt::print(stderr, "rotorq-cycles: {}\n", e.what());
    return 2;
  }
}
