//! The facts file schema (serde) and its translation into assertions with degrees.
