#include "qftplan/device/device_yaml.hpp"

// Reading device files: the schema walk over a parsed document (tree and raw-text checks live in the
// yaml_*.cpp files beside this one; device_yaml_write.cpp writes the format back).

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <optional>
#include <string_view>
#include <unordered_map>
#include <utility>
#include <vector>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include "qftplan/core/input_error.hpp"
#include "qftplan/device/calibration_profile.hpp"
#include "yaml_messages.hpp"
#include "yaml_scalars.hpp"
#include "yaml_text_check.hpp"
#include "yaml_tree.hpp"

namespace qftplan {
namespace {

using yaml_detail::NodeRef;
using yaml_detail::parse_integer;
using yaml_detail::parse_number;
using yaml_detail::Pos;
using yaml_detail::quote_text;
using yaml_detail::Tree;
using yaml_detail::unknown_key_message;

/// Device files larger than this are refused before they are read or parsed. Large enough for what
/// device_to_yaml writes for the biggest built-in lattices (grid:1000x1000 is about 71 MiB, ring:1000000
/// about 66 MiB), so that every lattice round-trips; memory stays near 1 GB thanks to the compact Tree.
constexpr std::uintmax_t kMaxDeviceFileMiB = 128;

const std::vector<std::string> kTopKeys = {"name",      "qubits",   "couplers", "calibration", "qubit_calibration",
                                           "positions", "native_2q"};
const std::vector<std::string> kCalibrationKeys = {"error_1q",       "error_2q", "error_readout", "duration_1q_ns",
                                                   "duration_2q_ns", "t1_us",    "t2_us",
                                                   "duration_readout_ns", "feed_forward_ns"};
const std::vector<std::string> kOverrideKeys = {"id",    "error_1q", "error_readout",       "duration_1q_ns",
                                                "t1_us", "t2_us",    "duration_readout_ns", "feed_forward_ns",
                                                "disabled"};
const std::vector<std::string> kCouplerKeys = {"pair", "error", "duration_ns", "disabled"};
const std::vector<std::string> kPositionKeys = {"id", "at"};

/// The member of CalibrationValues a key of `calibration` sets (keys are checked against kCalibrationKeys).
std::optional<double> CalibrationValues::*calibration_field(const std::string& key) {
  if (key == "error_1q") return &CalibrationValues::error_1q;
  if (key == "error_2q") return &CalibrationValues::error_2q;
  if (key == "error_readout") return &CalibrationValues::error_readout;
  if (key == "duration_1q_ns") return &CalibrationValues::duration_1q_ns;
  if (key == "duration_2q_ns") return &CalibrationValues::duration_2q_ns;
  if (key == "t1_us") return &CalibrationValues::t1_us;
  if (key == "duration_readout_ns") return &CalibrationValues::duration_readout_ns;
  if (key == "feed_forward_ns") return &CalibrationValues::feed_forward_ns;
  return &CalibrationValues::t2_us;
}

/// The member of QubitOverride a number key of a qubit_calibration entry sets (not "id" or "disabled").
std::optional<double> QubitOverride::*override_field(const std::string& key) {
  if (key == "error_1q") return &QubitOverride::error_1q;
  if (key == "error_readout") return &QubitOverride::error_readout;
  if (key == "duration_1q_ns") return &QubitOverride::duration_1q_ns;
  if (key == "t1_us") return &QubitOverride::t1_us;
  if (key == "duration_readout_ns") return &QubitOverride::duration_readout_ns;
  if (key == "feed_forward_ns") return &QubitOverride::feed_forward_ns;
  return &QubitOverride::t2_us;
}

/// Calibration profiles are a handful of lines: anything above this is not one.
constexpr std::uintmax_t kMaxProfileFileMiB = 1;

/// Walks a parsed document along the schema, validating with positions, and fills a description.
class Reader {
 public:
  Reader(const std::string& text, const std::string& source) : text_(text), source_(source) {}

  Device read() {
    return read_root(parse_root("device text", kMaxDeviceFileMiB, "a device description",
                                " with name, qubits and couplers", "a mapping with name, qubits and couplers"));
  }

  /// A calibration profile: one mapping of the `calibration` block's keys, at least one of them.
  CalibrationValues read_profile() {
    const NodeRef root =
        parse_root("calibration profile", kMaxProfileFileMiB, "a calibration profile", " such as {error_2q: 0.008}",
                   "a mapping of calibration values such as {error_2q: 0.008}");
    CalibrationValues cal;
    read_calibration_map(root, cal, "calibration profile");
    if (cal.empty())
      fail(node_pos(root), fmt::format("the calibration profile sets nothing; give at least one of {}",
                                       fmt::join(kCalibrationKeys, ", ")));
    if (auto why = lifetime_violation(cal.t1_us, cal.t2_us, "the calibration profile"); !why.empty())
      fail(node_pos(root), why);
    return cal;
  }

 private:
  /// The checks every document gets (size, encoding, characters, YAML syntax) and its root, which
  /// must be a mapping: `what` names the text in the size message, `expected` + `example` the content.
  NodeRef parse_root(const char* what, std::uintmax_t limit_mib, const std::string& expected, const char* example,
                     const char* mapping) {
    if (text_.size() > (limit_mib << 20))
      throw InputError(source_, 0, 0,
                       fmt::format("the {} is {} bytes, more than the limit of {} MiB", what, text_.size(), limit_mib));
    if ((normalized_ = yaml_detail::normalized_text(text_))) text_ = *normalized_;
    yaml_detail::check_raw_text(text_, source_);
    const int documents =
        yaml_detail::build_tree(text_, tree_, [this](Pos p, const std::string& msg) { fail(p, msg); });
    if (documents == 0) throw InputError(source_, 0, 0, "the file is empty; expected " + expected + example);
    const NodeRef root(tree_, tree_.root);
    if (root.null()) fail(node_pos(root), "the YAML document is empty; expected " + expected + example);
    if (!root.map()) fail(node_pos(root), fmt::format("expected {} ({}), found {}", expected, mapping, describe(root)));
    return root;
  }

  struct Entry {
    std::string key;
    Pos key_pos;
    NodeRef value;
  };

  [[noreturn]] void fail(Pos p, const std::string& message) const {
    throw InputError(source_, p.line, p.column, message);
  }

  /// Position of a node (an implicit empty value: the '-' or ':' before it).
  Pos node_pos(const NodeRef& n) const { return yaml_detail::node_pos(n, text_); }

  static std::string describe(const NodeRef& n) {
    if (n.null()) return "nothing";
    if (n.sequence()) return "a sequence";
    if (n.map()) return "a mapping";
    return (n.style() == Tree::Style::quoted ? "the quoted text " : "") + quote_text(n.text());
  }

  /// The keys of a mapping, in file order: each must be a known plain word and appear once.
  std::vector<Entry> entries(const NodeRef& map, const std::vector<std::string>& known, const std::string& context) {
    std::vector<Entry> out;
    for (std::size_t i = 0; i < map.size(); ++i) {
      const NodeRef k = map.key(i);
      const Pos kp = node_pos(k);
      if (!k.scalar()) fail(kp, fmt::format("expected a key name{}, found {}", in(context), describe(k)));
      const std::string key(k.text());
      if (std::find(known.begin(), known.end(), key) == known.end()) fail(kp, unknown_key_message(key, known, context));
      for (const auto& e : out)
        if (e.key == key)
          fail(kp, fmt::format("key '{}' appears twice{} (first on line {})", key, in(context), e.key_pos.line));
      out.push_back({key, kp, map.value(i)});
    }
    return out;
  }

  static std::string in(const std::string& context) { return context.empty() ? "" : " in " + context; }

  /// Where to report a problem with a mapping value: an implicit empty value has no useful mark of
  /// its own, so use its key's.
  Pos value_pos(const Entry& e) const { return e.value.null() ? e.key_pos : node_pos(e.value); }

  long long read_integer(const NodeRef& n, Pos p, const std::string& what) {
    if (!n.scalar() || n.style() != Tree::Style::plain)
      fail(p, fmt::format("{} must be a whole number, got {}", what, describe(n)));
    bool overflow = false;
    const auto v = parse_integer(n.text(), overflow);
    if (overflow) fail(p, fmt::format("{} is too large: {}", what, quote_text(n.text())));
    if (!v) fail(p, fmt::format("{} must be a whole number, got {}", what, describe(n)));
    return *v;
  }

  /// A number (never NaN: every range check below relies on that).
  double read_number(const NodeRef& n, Pos p, const std::string& what) {
    if (!n.scalar() || n.style() != Tree::Style::plain)
      fail(p, fmt::format("{} must be a number, got {}", what, describe(n)));
    const auto v = parse_number(n.text());
    if (!v) {
      // "inf" and "nan" are text in YAML 1.2 (section 10.3.2 writes .inf and .nan).
      std::string lower(n.text().substr(0, 16));
      std::transform(lower.begin(), lower.end(), lower.begin(), [](unsigned char c) { return std::tolower(c); });
      if (lower == "inf" || lower == "+inf" || lower == "infinity" || lower == "+infinity")
        fail(p, fmt::format("{} must be a number, got {} (YAML writes infinity as .inf)", what, describe(n)));
      fail(p, fmt::format("{} must be a number, got {}", what, describe(n)));
    }
    if (std::isnan(*v)) fail(p, fmt::format("{} must be a number, not NaN (got {})", what, n.text()));
    return *v;
  }

  double read_rate(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v >= 0.0 && v <= 1.0))
      fail(p, fmt::format("'{}' must be a probability in [0, 1], got {}", e.key, e.value.text()));
    return v;
  }

  /// A gate time in ns: positive and at most kMaxGateDurationNs.
  double read_duration(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v > 0.0 && v <= kMaxGateDurationNs))
      fail(p, fmt::format("'{}' must be a positive number of ns, at most 1e9 (one second), got {}", e.key,
                          e.value.text()));
    return v;
  }

  /// A T1 or T2 time in microseconds: positive, or .inf for a qubit that does not decay.
  double read_lifetime(const Entry& e) {
    const Pos p = value_pos(e);
    const double v = read_number(e.value, p, "'" + e.key + "'");
    if (!(v > 0.0))
      fail(p, fmt::format("'{}' must be a positive number (or .inf for no decay), got {}", e.key, e.value.text()));
    return v;
  }

  /// A flag: the YAML 1.2 core schema's booleans (section 10.3.2: true, True, TRUE, false, False, FALSE).
  bool read_flag(const Entry& e) {
    const Pos p = value_pos(e);
    if (e.value.scalar() && e.value.style() == Tree::Style::plain) {
      const std::string_view t = e.value.text();
      if (t == "true" || t == "True" || t == "TRUE") return true;
      if (t == "false" || t == "False" || t == "FALSE") return false;
    }
    fail(p, fmt::format("'{}' must be true or false, got {}", e.key, describe(e.value)));
  }

  /// A calibration value: error rates are probabilities, durations (and the feed-forward latency)
  /// times in ns, t1/t2 lifetimes.
  double read_value(const Entry& e) {
    if (e.key.starts_with("error")) return read_rate(e);
    if (e.key.starts_with("duration") || e.key == "feed_forward_ns") return read_duration(e);
    return read_lifetime(e);
  }

  /// A qubit id, the value of 'id' in an entry of `list`, that must name one of the device's qubits.
  int read_qubit_id(const NodeRef& n, Pos p, const std::string& list) {
    const long long id = read_integer(n, p, "'id' in " + list);
    if (id < 0 || id >= qubits_)
      fail(p, fmt::format("{} names qubit {}, but the device's qubits are 0..{}", list, id, qubits_ - 1));
    return static_cast<int>(id);
  }

  static const Entry* find(const std::vector<Entry>& es, const std::string& key) {
    for (const auto& e : es)
      if (e.key == key) return &e;
    return nullptr;
  }

  Device read_root(const NodeRef& root) {
    const auto top = entries(root, kTopKeys, "");
    const Pos root_pos = node_pos(root);
    DeviceDescription d;

    const Entry* name = find(top, "name");
    if (!name) fail(root_pos, "missing required key 'name'");
    if (!name->value.scalar())
      fail(value_pos(*name), fmt::format("'name' must be text, got {}", describe(name->value)));
    d.name = name->value.text();
    if (d.name.empty()) fail(value_pos(*name), "'name' must not be empty");

    const Entry* qubits = find(top, "qubits");
    if (!qubits) fail(root_pos, "missing required key 'qubits'");
    const Pos qp = value_pos(*qubits);
    const long long n = read_integer(qubits->value, qp, "'qubits'");
    if (n < 1) fail(qp, fmt::format("'qubits' must be at least 1, got {}", n));
    // Refuse before anything is sized by the qubit count.
    if (n > kMaxDeviceQubits) fail(qp, fmt::format("'qubits' is {}, more than the limit of {}", n, kMaxDeviceQubits));
    qubits_ = static_cast<int>(n);
    d.qubits = qubits_;

    const Entry* couplers = find(top, "couplers");
    if (!couplers) fail(root_pos, "missing required key 'couplers' (write 'couplers: []' for a chip without any)");
    read_couplers(*couplers, d);

    if (const Entry* e = find(top, "calibration")) {
      read_calibration(*e, d.calibration);
      if (auto why = lifetime_violation(d.calibration.t1_us, d.calibration.t2_us, "calibration"); !why.empty())
        fail(value_pos(*e), why);
    }
    if (const Entry* e = find(top, "qubit_calibration")) read_overrides(*e, d);
    if (const Entry* e = find(top, "positions")) read_positions(*e, d);
    if (const Entry* e = find(top, "native_2q")) {
      const Pos p = value_pos(*e);
      if (!e->value.scalar() || (e->value.text() != "cx" && e->value.text() != "cz"))
        fail(p, fmt::format("unknown native_2q {}; expected cx or cz", describe(e->value)));
      d.native_2q = e->value.text() == "cz" ? TwoQubitGate::cz : TwoQubitGate::cx;
    }

    try {
      return Device(std::move(d));
    } catch (const InputError& err) {
      // The checks above should have caught everything with a position; this is the backstop.
      throw InputError(source_, 0, 0, err.message());
    }
  }

  void read_couplers(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'couplers' must be a sequence of qubit pairs such as [0, 1] (use [] for none), "
                                     "got {}",
                                     describe(e.value)));
    const std::size_t count = e.value.size();
    d.couplers.reserve(count);
    std::vector<int> line_of;  // line of each accepted coupler, for duplicate messages
    line_of.reserve(count);
    std::unordered_map<std::uint64_t, int> seen;
    seen.reserve(count);
    for (std::size_t i = 0; i < count; ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      NodeRef pair = item;
      Pos pair_pos = ip;
      Coupler c;
      if (item.map()) {
        const auto fields = entries(item, kCouplerKeys, "coupler");
        const Entry* p = find(fields, "pair");
        if (!p) fail(ip, "a coupler mapping needs 'pair: [a, b]'");
        pair = p->value;
        pair_pos = value_pos(*p);
        if (const Entry* f = find(fields, "error")) c.error = read_rate(*f);
        if (const Entry* f = find(fields, "duration_ns")) c.duration_ns = read_duration(*f);
        if (const Entry* f = find(fields, "disabled")) c.disabled = read_flag(*f);
      } else if (!item.sequence()) {
        fail(ip, fmt::format("a coupler must be a pair such as [0, 1] or a mapping such as "
                             "{{pair: [0, 1], error: 0.01}}, got {}",
                             describe(item)));
      }
      if (!pair.sequence())
        fail(pair_pos, fmt::format("a coupler's pair must be a sequence of two qubit ids, got {}", describe(pair)));
      if (pair.size() != 2) fail(pair_pos, fmt::format("a coupler must name exactly two qubits, got {}", pair.size()));
      const NodeRef na = pair[0], nb = pair[1];
      const long long a = read_integer(na, node_pos(na), "qubit id");
      const long long b = read_integer(nb, node_pos(nb), "qubit id");
      for (const auto& [id, node] : {std::pair{a, na}, std::pair{b, nb}})
        if (id < 0 || id >= qubits_)
          fail(node_pos(node), fmt::format("coupler [{}, {}] names qubit {}, but the device's qubits are 0..{}", a, b,
                                           id, qubits_ - 1));
      if (a == b) fail(pair_pos, fmt::format("coupler [{}, {}] joins qubit {} to itself", a, b, a));
      const auto lo = static_cast<std::uint64_t>(std::min(a, b)), hi = static_cast<std::uint64_t>(std::max(a, b));
      const auto [it, fresh] =
          seen.emplace(lo * static_cast<std::uint64_t>(qubits_) + hi, static_cast<int>(d.couplers.size()));
      if (!fresh) {
        const Coupler& first = d.couplers[it->second];
        const int first_line = line_of[it->second];
        if (first.a == a)
          fail(pair_pos, fmt::format("coupler [{}, {}] is listed twice (first on line {})", a, b, first_line));
        fail(pair_pos, fmt::format("coupler [{}, {}] repeats [{}, {}] from line {} (couplers are undirected)", a, b,
                                   first.a, first.b, first_line));
      }
      c.a = static_cast<int>(a);
      c.b = static_cast<int>(b);
      d.couplers.push_back(c);
      line_of.push_back(pair_pos.line);
    }
  }

  void read_calibration(const Entry& e, CalibrationValues& cal) {
    if (!e.value.map())
      fail(value_pos(e),
           fmt::format("'calibration' must be a mapping such as {{error_2q: 0.008}}, got {}", describe(e.value)));
    read_calibration_map(e.value, cal, "calibration");
  }

  void read_calibration_map(const NodeRef& map, CalibrationValues& cal, const std::string& context) {
    for (const auto& f : entries(map, kCalibrationKeys, context)) {
      // An infinite T1 or T2 (.inf) is a qubit that does not decay: kept as written.
      cal.*calibration_field(f.key) = read_value(f);
    }
  }

  void read_overrides(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'qubit_calibration' must be a sequence of mappings such as "
                                     "{{id: 3, t1_us: 40}}, got {}",
                                     describe(e.value)));
    std::unordered_map<int, int> line_of;  // qubit id -> line of its entry
    for (std::size_t i = 0; i < e.value.size(); ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      if (!item.map())
        fail(ip, fmt::format("a qubit_calibration entry must be a mapping such as {{id: 3, t1_us: 40}}, got {}",
                             describe(item)));
      const auto fields = entries(item, kOverrideKeys, "qubit_calibration");
      const Entry* id = find(fields, "id");
      if (!id) fail(ip, "a qubit_calibration entry needs 'id'");
      QubitOverride o;
      o.id = read_qubit_id(id->value, value_pos(*id), "qubit_calibration");
      if (const auto [it, fresh] = line_of.emplace(o.id, value_pos(*id).line); !fresh)
        fail(value_pos(*id),
             fmt::format("qubit_calibration lists qubit {} twice (first on line {})", o.id, it->second));
      for (const auto& f : fields) {
        if (f.key == "id") continue;
        if (f.key == "disabled")
          o.disabled = read_flag(f);
        else
          o.*override_field(f.key) = read_value(f);
      }
      // T1 and T2 as applied to this qubit (its own, else the device-wide value).
      const auto t1 = o.t1_us ? o.t1_us : d.calibration.t1_us, t2 = o.t2_us ? o.t2_us : d.calibration.t2_us;
      if (auto why = lifetime_violation(t1, t2, fmt::format("qubit {}", o.id)); !why.empty()) fail(ip, why);
      d.qubit_calibration.push_back(o);
    }
  }

  void read_positions(const Entry& e, DeviceDescription& d) {
    if (!e.value.sequence())
      fail(value_pos(e), fmt::format("'positions' must be a sequence of mappings such as {{id: 0, at: [0.0, 0.0]}}, "
                                     "got {}",
                                     describe(e.value)));
    // The key's presence alone gives one (possibly empty) slot per qubit, so that writing back
    // "positions: []" reproduces the same description.
    d.positions.assign(qubits_, std::nullopt);
    std::vector<int> line_of(qubits_, 0);
    for (std::size_t i = 0; i < e.value.size(); ++i) {
      const NodeRef item = e.value[i];
      const Pos ip = node_pos(item);
      if (!item.map())
        fail(ip, fmt::format("a positions entry must be a mapping such as {{id: 0, at: [0.0, 0.0]}}, got {}",
                             describe(item)));
      const auto fields = entries(item, kPositionKeys, "positions");
      const Entry* id = find(fields, "id");
      const Entry* at = find(fields, "at");
      if (!id) fail(ip, "a positions entry needs 'id'");
      if (!at) fail(ip, "a positions entry needs 'at: [x, y]'");
      const int q = read_qubit_id(id->value, value_pos(*id), "positions");
      if (line_of[q] > 0)
        fail(value_pos(*id), fmt::format("positions lists qubit {} twice (first on line {})", q, line_of[q]));
      line_of[q] = value_pos(*id).line;
      const Pos ap = value_pos(*at);
      if (!at->value.sequence())
        fail(ap, fmt::format("'at' must be a pair of coordinates [x, y], got {}", describe(at->value)));
      if (at->value.size() != 2)
        fail(ap, fmt::format("'at' must be a pair of coordinates [x, y], got a list of {}", at->value.size()));
      Point pt;
      const NodeRef nx = at->value[0], ny = at->value[1];
      pt.x = read_number(nx, node_pos(nx), "a coordinate");
      pt.y = read_number(ny, node_pos(ny), "a coordinate");
      if (!std::isfinite(pt.x) || !std::isfinite(pt.y))
        fail(ap, fmt::format("coordinates must be finite numbers, got [{}, {}]", nx.text(), ny.text()));
      d.positions[q] = pt;
    }
  }

  std::string_view text_;                  // the text as parsed (normalized_ when that was needed)
  std::optional<std::string> normalized_;  // line breaks made LF, byte order mark dropped
  const std::string& source_;
  Tree tree_;
  int qubits_ = 0;
};

}  // namespace

Device parse_device_yaml(const std::string& text, const std::string& source) { return Reader(text, source).read(); }

namespace {

/// The text of a YAML file of `kind` ("device file", "calibration profile"), refused above `limit_mib`.
std::string read_yaml_file(const std::string& path, const char* kind, std::uintmax_t limit_mib) {
  namespace fs = std::filesystem;
  const std::uintmax_t limit = limit_mib << 20;
  if (path.empty()) throw InputError(fmt::format("no {} given (the path is empty)", kind));
  std::error_code ec;
  const auto status = fs::status(path, ec);
  if (!fs::exists(status)) {
    if (ec && ec != std::errc::no_such_file_or_directory) throw InputError(path, 0, 0, "cannot open: " + ec.message());
    throw InputError(path, 0, 0, "no such file");
  }
  if (fs::is_directory(status)) throw InputError(path, 0, 0, fmt::format("is a directory, not a {}", kind));
  if (!fs::is_regular_file(status)) throw InputError(path, 0, 0, "is not a regular file");
  const auto size = fs::file_size(path, ec);
  if (!ec && size > limit)
    throw InputError(path, 0, 0, fmt::format("the file is {} bytes, more than the limit of {} MiB", size, limit_mib));
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path, 0, 0, std::string("cannot open: ") + std::strerror(errno));
  // Read at most one byte past the limit, in case the file grew since it was measured.
  std::string text(static_cast<std::size_t>(std::min<std::uintmax_t>(ec ? 0 : size, limit)), '\0');
  in.read(text.data(), static_cast<std::streamsize>(text.size()));
  text.resize(static_cast<std::size_t>(in.gcount()));
  char buf[65536];
  while (in && text.size() <= limit) {
    in.read(buf, sizeof buf);
    text.append(buf, static_cast<std::size_t>(in.gcount()));
  }
  if (in.bad()) throw InputError(path, 0, 0, "cannot read the file");
  if (text.size() > limit) throw InputError(path, 0, 0, fmt::format("the file is more than the limit of {} MiB", limit_mib));
  return text;
}

}  // namespace

Device load_device_file(const std::string& path) {
  return parse_device_yaml(read_yaml_file(path, "device file", kMaxDeviceFileMiB), path);
}

CalibrationProfile parse_calibration_profile(const std::string& text, const std::string& source) {
  return CalibrationProfile{Reader(text, source).read_profile(), source};
}

CalibrationProfile load_calibration_profile(const std::string& path) {
  return parse_calibration_profile(read_yaml_file(path, "calibration profile", kMaxProfileFileMiB), path);
}

}  // namespace qftplan
