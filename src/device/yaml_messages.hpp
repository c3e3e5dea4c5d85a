#pragma once
/// \file yaml_messages.hpp
/// Private to the device layer: how the device YAML reader quotes user text and names unknown keys.

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace qftplan::yaml_detail {

/// User text quoted back in a one-line message: control characters blanked, text past `limit` bytes cut.
std::string printable(std::string_view s, std::size_t limit);

/// `s` in single quotes, made printable and cut after 40 bytes.
std::string quote_text(std::string_view s);

/// "unknown key 'qbits'; did you mean 'qubits'?", or the list of `known` keys when none is close;
/// `context` names the mapping ("" for the top level).
std::string unknown_key_message(const std::string& key, const std::vector<std::string>& known,
                                const std::string& context);

}  // namespace qftplan::yaml_detail
