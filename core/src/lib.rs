//! bandgauge-core: the physics of bandgauge, pure Rust with no I/O and no UI types.
//!
//! One module per physical concept. Every public formula function documents its
//! formula, validity range and published source; every parameter set carries
//! its source beside it (see `REFERENCES.md` at the repository root for the full
//! citation list and the keys used in code).

pub mod bandgap;
pub mod constants;
pub mod dos;
pub mod intrinsic;
pub mod materials;

pub use materials::Material;
