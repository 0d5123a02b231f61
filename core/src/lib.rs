//! bandgauge-core: the physics of bandgauge, pure Rust with no I/O and no UI types.
//!
//! One module per physical concept. Every public formula function documents its
//! formula, validity range and published source; every parameter set carries
//! its source beside it (see `REFERENCES.md` at the repository root for the full
//! citation list and the keys used in code).

pub mod bandgap;
pub mod bgn;
pub mod compare;
pub mod constants;
pub mod dos;
pub mod empirical;
pub mod errors;
pub mod fermi_dirac;
pub mod hall;
pub mod intrinsic;
pub mod ionization;
pub mod lots;
pub mod materials;
pub mod mobility;
pub mod neutrality;
pub mod order;
pub mod params;
pub mod probe;
pub mod resistivity;
pub mod sweep;
pub mod uncertainty;
pub mod units;
pub mod vdp;

pub use bgn::BgnModel;
pub use intrinsic::IntrinsicModel;
pub use materials::{Dopant, DopantDensity, DopantKind, Material, MaterialError};
pub use neutrality::{CarrierError, Equilibrium, ModelUsed, Regime, SolveOptions, SpeciesState};
