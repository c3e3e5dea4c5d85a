#pragma once
/// \file yaml_text_check.hpp
/// Private to the device layer: what is done to a device file's raw text before yaml-cpp parses it.

#include <optional>
#include <string>
#include <string_view>

namespace qftplan::yaml_detail {

/// The text as yaml-cpp should see it (line breaks made LF, a UTF-8 byte order mark dropped, so that
/// lines, columns and offsets stay those of the file), or nullopt when it needs no change.
std::optional<std::string> normalized_text(std::string_view text);

/// Refuses text that is not UTF-8, holds characters YAML 1.2 does not allow, or nests flow collections
/// more than 64 deep: throws InputError naming `source`, with the line and column of the first offence.
void check_raw_text(std::string_view text, const std::string& source);

}  // namespace qftplan::yaml_detail
