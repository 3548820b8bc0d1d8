// The heavy third-party headers every layer includes, compiled once per build (CMake's
// precompiled headers): parsing Boost.Multiprecision, nlohmann-json and fmt was over half of
// the compile time of a typical source file.
#pragma once

#include <gmpxx.h>
#include <mpfi.h>
#include <mpfr.h>

#include <algorithm>
#include <boost/multiprecision/mpfi.hpp>
#include <boost/multiprecision/mpfr.hpp>
#include <cmath>
#include <fmt/format.h>
#include <nlohmann/json.hpp>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>
