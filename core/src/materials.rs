//! Material parameter sets, each number with its published source.

use crate::bandgap::Varshni;
use crate::dos::PowerLaw;
use crate::intrinsic;

/// A semiconductor with the parameters the core needs.
#[derive(Debug, Clone, PartialEq)]
pub struct Material {
    /// Short identifier, e.g. "si".
    pub id: String,
    /// Display name.
    pub name: String,
    /// Band gap model.
    pub varshni: Varshni,
    /// Source of the band gap parameters.
    pub varshni_source: String,
    /// Conduction-band effective density of states.
    pub nc: PowerLaw,
    /// Valence-band effective density of states.
    pub nv: PowerLaw,
    /// Source of the density-of-states parameters.
    pub dos_source: String,
}

impl Material {
    /// Intrinsic density in cm^-3 at `temperature_k` from Varshni gap and Nc, Nv.
    pub fn intrinsic_density_cm3(&self, temperature_k: f64) -> f64 {
        intrinsic::from_dos_cm3(
            self.nc.at(temperature_k),
            self.nv.at(temperature_k),
            self.varshni.band_gap_ev(temperature_k),
            temperature_k,
        )
    }
}

/// Silicon.
pub fn silicon() -> Material {
    Material {
        id: "si".into(),
        name: "Silicon".into(),
        // Source: Thurmond, J. Electrochem. Soc. 122, 1133 (1975).
        varshni: Varshni { eg0_ev: 1.17, alpha_ev_per_k: 4.73e-4, beta_k: 636.0 },
        varshni_source: "Thurmond 1975".into(),
        // Source: Green, J. Appl. Phys. 67, 2944 (1990): Nc = 2.86e19 (T/300)^1.58,
        // Nv = 3.10e19 (T/300)^1.85, 200-500 K, about 2 %.
        nc: PowerLaw { at_300k_cm3: 2.86e19, exponent: 1.58 },
        nv: PowerLaw { at_300k_cm3: 3.10e19, exponent: 1.85 },
        dos_source: "Green 1990".into(),
    }
}
