// Empty: the target that owns the precompiled header (cmake/precompiled.hpp).
