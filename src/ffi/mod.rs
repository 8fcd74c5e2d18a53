//! The C ABI (placeholder module, filled in by the ffi layer).
