//! Configuration from flags and environment.
