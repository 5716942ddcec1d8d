//! Wiring: builds the application from configuration.
