//! The knowledge base: interned vocabulary, hash-consed concepts in negation normal form,
//! axioms, and loading through horned-owl.
