//! Integration tests, built as one binary to keep link time down.

mod colouring;
