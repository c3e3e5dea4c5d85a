#pragma once
/// \file device_yaml.hpp
/// Reading and writing device descriptions in qftplan's YAML format (see README "Device files").

#include <string>

#include "qftplan/device/device.hpp"

namespace qftplan {

/// Parses YAML text (UTF-8; CR, CRLF or LF line ends); `source` names the file in error messages. Strict:
/// unknown keys are errors that suggest the nearest known key; tags, NUL characters and flow nesting deeper
/// than 64 are refused. Throws InputError with file, line and column.
Device parse_device_yaml(const std::string& text, const std::string& source);

/// Reads and parses a device file. Throws InputError for missing files, directories, bad YAML.
Device load_device_file(const std::string& path);

/// Writes the device in the same format; parse_device_yaml(device_to_yaml(d)) == d.
std::string device_to_yaml(const Device& device);

}  // namespace qftplan
