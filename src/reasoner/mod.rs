//! The tableau reasoner for SHIQ with numeric data ranges.
