//! Material and dopant parameter sets, each number with its published source.
//!
//! Citation keys in the source strings (`Thurmond1975`, `Green1990`, ...) are the
//! keys of `REFERENCES.md` at the repository root. "from memory" marks a value
//! recalled rather than read in the source while this file was written.
//!
//! Mobility parameters are deliberately not here: the mobility module keeps
//! them keyed by material id and dopant symbol.

use std::borrow::Cow;
use std::fmt;

use serde::{Deserialize, Serialize};

use crate::params::{
    self, AltermattParameters, IntrinsicFit, PearsonBardeenParameters, PowerLaw, SlotboomParams,
    Varshni,
};

/// Donor or acceptor.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum DopantKind {
    /// Gives an electron to the conduction band; positive when ionized.
    Donor,
    /// Takes an electron from the valence band; negative when ionized.
    Acceptor,
}

impl fmt::Display for DopantKind {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            DopantKind::Donor => "donor",
            DopantKind::Acceptor => "acceptor",
        })
    }
}

/// A dopant species with a single hydrogen-like level.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Dopant {
    /// Chemical symbol, e.g. "P" (borrowed for the built-in dopants, so results copy no text).
    pub symbol: Cow<'static, str>,
    /// Donor or acceptor.
    pub kind: DopantKind,
    /// Ionization energy in eV, measured from the conduction band edge
    /// (donors, E_C - E_D) or from the valence band edge (acceptors, E_A - E_V).
    pub ionization_energy_ev: f64,
    /// Ground-state degeneracy factor g (2 for donors, 4 for acceptors in
    /// silicon, germanium and GaAs with a degenerate valence band top).
    pub degeneracy: f64,
    /// Where the ionization energy and degeneracy come from (borrowed for the built-in
    /// dopants).
    pub source: Cow<'static, str>,
    /// The Altermatt et al. (2006) set of this dopant in this host, if published (silicon P,
    /// As, B): the density-dependent level and localized fraction of
    /// [`crate::ionization::IonizationModel::Altermatt`].
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub altermatt: Option<AltermattParameters>,
}

impl Dopant {
    /// A user-defined dopant, validated.
    ///
    /// # Errors
    /// [`MaterialError::InvalidParameter`] naming the field when the symbol is
    /// empty, the ionization energy is negative or not finite, or the
    /// degeneracy is not finite and > 0.
    pub fn new(
        symbol: &str,
        kind: DopantKind,
        ionization_energy_ev: f64,
        degeneracy: f64,
        source: &str,
    ) -> Result<Dopant, MaterialError> {
        let d = Dopant {
            symbol: Cow::Owned(symbol.to_owned()),
            kind,
            ionization_energy_ev,
            degeneracy,
            source: Cow::Owned(source.to_owned()),
            altermatt: None,
        };
        d.validate()?;
        Ok(d)
    }

    /// Checks every field.
    ///
    /// # Errors
    /// [`MaterialError::InvalidParameter`] or [`MaterialError::EmptyText`] naming the field.
    pub fn validate(&self) -> Result<(), MaterialError> {
        if self.symbol.chars().all(char::is_whitespace) {
            return Err(MaterialError::EmptyText {
                field: "dopant.symbol".into(),
            });
        }
        let field = |name: &str| format!("dopant {}: {name}", self.symbol);
        if !(self.ionization_energy_ev.is_finite() && self.ionization_energy_ev >= 0.0) {
            return Err(MaterialError::InvalidParameter {
                field: field("ionization_energy_ev"),
                value: self.ionization_energy_ev,
                allowed: "a finite value >= 0 eV",
            });
        }
        if !(self.degeneracy.is_finite() && self.degeneracy > 0.0) {
            return Err(MaterialError::InvalidParameter {
                field: field("degeneracy"),
                value: self.degeneracy,
                allowed: "a finite value > 0",
            });
        }
        if let Some((name, value, allowed)) =
            self.altermatt.as_ref().and_then(|p| p.invalid_field())
        {
            return Err(MaterialError::InvalidParameter {
                field: field(&format!("altermatt.{name}")),
                value,
                allowed,
            });
        }
        Ok(())
    }
}

/// An amount of one dopant species.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct DopantDensity {
    /// The species.
    pub dopant: Dopant,
    /// Total (ionized and neutral) density, cm^-3.
    pub density_cm3: f64,
}

/// Where each group of a material's parameters comes from.
///
/// `Cow` so that the built-in materials' sources are static text that results
/// can name without copying (a solve must stay well under a microsecond).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct MaterialSources {
    /// Varshni parameters.
    pub band_gap: Cow<'static, str>,
    /// Nc and Nv at 300 K and their temperature exponents.
    pub density_of_states: Cow<'static, str>,
    /// Relative permittivity.
    pub permittivity: Cow<'static, str>,
}

/// A semiconductor with the parameters the carrier-statistics core needs.
///
/// Every field is public so that a user-defined material can be written out
/// in full; call [`Material::validate`] (the solver does) before use.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Material {
    /// Short identifier, e.g. "si" (lower case by convention; looked up case-insensitively).
    pub id: String,
    /// Display name.
    pub name: String,
    /// Band gap model.
    pub varshni: Varshni,
    /// Conduction-band effective density of states.
    pub nc: PowerLaw,
    /// Valence-band effective density of states.
    pub nv: PowerLaw,
    /// Static relative permittivity (dimensionless).
    pub relative_permittivity: f64,
    /// Dopant species with their levels.
    pub dopants: Vec<Dopant>,
    /// Sources of the parameter groups above.
    pub sources: MaterialSources,
    /// The Pearson-Bardeen alpha values of this host, if any (silicon): the density-dependent
    /// level of [`crate::ionization::IonizationModel::PearsonBardeen`].
    #[serde(default)]
    pub pearson_bardeen: Option<PearsonBardeenParameters>,
    /// A published direct fit of the intrinsic density, if one exists
    /// (silicon: Misiakos & Tsamakis 1993).
    #[serde(default)]
    pub intrinsic_fit: Option<IntrinsicFit>,
    /// The band-gap narrowing parameter set fitted for this material, if any
    /// (silicon: Slotboom & de Graaff 1977).
    #[serde(default)]
    pub band_gap_narrowing: Option<SlotboomParams>,
}

impl Material {
    /// The dopant with `symbol` (case-insensitive: "P", "b").
    ///
    /// # Errors
    /// [`MaterialError::UnknownDopant`] listing the symbols this material knows.
    pub fn dopant(&self, symbol: &str) -> Result<Dopant, MaterialError> {
        let wanted = symbol.trim();
        self.dopants
            .iter()
            .find(|d| d.symbol.eq_ignore_ascii_case(wanted))
            .cloned()
            .ok_or_else(|| MaterialError::UnknownDopant {
                material: self.id.clone(),
                symbol: symbol.to_owned(),
                known: self.dopants.iter().map(|d| d.symbol.to_string()).collect(),
            })
    }

    /// The dopant with `symbol`, which must be of `kind` (for input that says
    /// "donor P" or "acceptor B").
    ///
    /// # Errors
    /// [`MaterialError::UnknownDopant`], or [`MaterialError::WrongKind`] when
    /// the species exists but is of the other kind.
    pub fn dopant_of_kind(&self, symbol: &str, kind: DopantKind) -> Result<Dopant, MaterialError> {
        let d = self.dopant(symbol)?;
        if d.kind != kind {
            return Err(MaterialError::WrongKind {
                material: self.id.clone(),
                symbol: d.symbol.to_string(),
                requested: kind,
                actual: d.kind,
            });
        }
        Ok(d)
    }

    /// Checks every parameter.
    ///
    /// # Errors
    /// [`MaterialError::InvalidParameter`] naming the first bad field, its
    /// value and what is allowed; [`MaterialError::EmptyText`] for an empty
    /// id or name; [`MaterialError::DuplicateDopant`] when two species share a
    /// symbol (case-insensitively).
    pub fn validate(&self) -> Result<(), MaterialError> {
        if self.id.trim().is_empty() {
            return Err(MaterialError::EmptyText {
                field: "material.id".into(),
            });
        }
        if self.name.trim().is_empty() {
            return Err(MaterialError::EmptyText {
                field: "material.name".into(),
            });
        }
        self.validate_parameters()?;
        for (i, d) in self.dopants.iter().enumerate() {
            d.validate()?;
            if self.dopants[..i]
                .iter()
                .any(|e| e.symbol.eq_ignore_ascii_case(&d.symbol))
            {
                return Err(MaterialError::DuplicateDopant {
                    material: self.id.clone(),
                    symbol: d.symbol.to_string(),
                });
            }
        }
        Ok(())
    }

    /// Checks the numeric parameters the carrier computations use (band gap,
    /// densities of states, permittivity, optional fits); the solver calls
    /// this and validates the dopants it is given separately.
    ///
    /// # Errors
    /// [`MaterialError::InvalidParameter`] naming the first bad field.
    pub fn validate_parameters(&self) -> Result<(), MaterialError> {
        let bad = |field: String, value: f64, allowed: &'static str| {
            Err(MaterialError::InvalidParameter {
                field,
                value,
                allowed,
            })
        };
        if let Some((f, v, a)) = self.varshni.invalid_field() {
            return bad(format!("material {}: {f}", self.id), v, a);
        }
        if let Some((f, v, a)) = self.nc.invalid_field() {
            return bad(format!("material {}: nc.{f}", self.id), v, a);
        }
        if let Some((f, v, a)) = self.nv.invalid_field() {
            return bad(format!("material {}: nv.{f}", self.id), v, a);
        }
        if !(self.relative_permittivity.is_finite() && self.relative_permittivity > 0.0) {
            return bad(
                format!("material {}: relative_permittivity", self.id),
                self.relative_permittivity,
                "a finite value > 0",
            );
        }
        if let Some(p) = &self.pearson_bardeen
            && let Some((f, v, a)) = p.invalid_field()
        {
            return bad(format!("material {}: pearson_bardeen.{f}", self.id), v, a);
        }
        if let Some(fit) = &self.intrinsic_fit
            && let Some((f, v, a)) = fit.invalid_field()
        {
            return bad(format!("material {}: intrinsic_fit.{f}", self.id), v, a);
        }
        if let Some(p) = &self.band_gap_narrowing
            && let Some((f, v, a)) = p.invalid_field()
        {
            return bad(
                format!("material {}: band_gap_narrowing.{f}", self.id),
                v,
                a,
            );
        }
        Ok(())
    }
}

/// Why a material or dopant was refused or not found.
#[derive(Debug, Clone, PartialEq)]
#[non_exhaustive]
pub enum MaterialError {
    /// No built-in material has this id.
    UnknownMaterial {
        /// The id given.
        id: String,
        /// The ids that exist.
        known: Vec<String>,
    },
    /// The material has no dopant with this symbol.
    UnknownDopant {
        /// Material id.
        material: String,
        /// The symbol given.
        symbol: String,
        /// The symbols that exist for this material.
        known: Vec<String>,
    },
    /// The species exists but is a donor where an acceptor was asked for, or the reverse.
    WrongKind {
        /// Material id.
        material: String,
        /// The species.
        symbol: String,
        /// What the input asked for.
        requested: DopantKind,
        /// What the species is.
        actual: DopantKind,
    },
    /// A numeric parameter is out of its allowed range.
    InvalidParameter {
        /// Which field, e.g. "material si: nc.at_300k_cm3".
        field: String,
        /// The value given.
        value: f64,
        /// What is allowed.
        allowed: &'static str,
    },
    /// A text field that must not be empty is empty.
    EmptyText {
        /// Which field.
        field: String,
    },
    /// Two dopants of one material share a symbol.
    DuplicateDopant {
        /// Material id.
        material: String,
        /// The repeated symbol.
        symbol: String,
    },
}

impl fmt::Display for MaterialError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MaterialError::UnknownMaterial { id, known } => write!(
                f,
                "material: '{id}' is not a known material; choose one of {}",
                known.join(", ")
            ),
            MaterialError::UnknownDopant {
                material,
                symbol,
                known,
            } => write!(
                f,
                "dopant: '{symbol}' is not a known dopant of {material}; choose one of {}",
                known.join(", ")
            ),
            MaterialError::WrongKind {
                material,
                symbol,
                requested,
                actual,
            } => write!(
                f,
                "dopant: {symbol} in {material} is {}, not {}",
                with_article(*actual),
                with_article(*requested)
            ),
            MaterialError::InvalidParameter {
                field,
                value,
                allowed,
            } => {
                write!(f, "{field}: {value} is not allowed; give {allowed}")
            }
            MaterialError::EmptyText { field } => {
                write!(f, "{field}: an empty text is not allowed; give a name")
            }
            MaterialError::DuplicateDopant { material, symbol } => write!(
                f,
                "dopant: {symbol} appears twice in {material}; give each species once"
            ),
        }
    }
}

impl std::error::Error for MaterialError {}

fn with_article(kind: DopantKind) -> &'static str {
    match kind {
        DopantKind::Donor => "a donor",
        DopantKind::Acceptor => "an acceptor",
    }
}

/// All built-in materials, in a stable order.
pub fn builtin() -> Vec<Material> {
    vec![
        silicon(),
        germanium(),
        gallium_arsenide(),
        gallium_nitride(),
    ]
}

/// The built-in material with `id` ("si", "ge", "gaas", "gan"; case-insensitive).
///
/// # Errors
/// [`MaterialError::UnknownMaterial`] listing the known ids.
pub fn by_id(id: &str) -> Result<Material, MaterialError> {
    let wanted = id.trim();
    let all = builtin();
    let known: Vec<String> = all.iter().map(|m| m.id.clone()).collect();
    all.into_iter()
        .find(|m| m.id.eq_ignore_ascii_case(wanted))
        .ok_or(MaterialError::UnknownMaterial {
            id: id.to_owned(),
            known,
        })
}

fn dopant(
    symbol: &'static str,
    kind: DopantKind,
    ionization_mev: f64,
    source: &'static str,
) -> Dopant {
    // Source: ground-state degeneracy g_D = 2 (spin) for donors and g_A = 4
    // (spin and the degenerate heavy/light-hole band top) for acceptors in
    // Si, Ge, GaAs: common practice, no source (see e.g. Sze 1981, ch. 1).
    let degeneracy = match kind {
        DopantKind::Donor => 2.0,
        DopantKind::Acceptor => 4.0,
    };
    Dopant {
        symbol: symbol.into(),
        kind,
        ionization_energy_ev: ionization_mev * 1e-3,
        degeneracy,
        source: source.into(),
        altermatt: None,
    }
}

/// `d` with its Altermatt et al. (2006) set.
fn with_altermatt(d: Dopant, set: AltermattParameters) -> Dopant {
    Dopant {
        altermatt: Some(set),
        ..d
    }
}

/// Silicon.
pub fn silicon() -> Material {
    use DopantKind::{Acceptor, Donor};
    const SZE: &str = "Sze1981: measured ionization energies in Si (Sze, Physics of Semiconductor \
                       Devices, 2nd ed., 1981, ch. 1); g: common practice";
    Material {
        id: "si".into(),
        name: "Silicon".into(),
        // Source: Thurmond, J. Electrochem. Soc. 122, 1133 (1975): Eg0 = 1.17 eV,
        // alpha = 4.73e-4 eV/K, beta = 636 K.
        varshni: Varshni {
            eg0_ev: 1.17,
            alpha_ev_per_k: 4.73e-4,
            beta_k: 636.0,
        },
        // Source: Green, J. Appl. Phys. 67, 2944 (1990): Nc = 2.86e19 (T/300)^1.58,
        // Nv = 3.10e19 (T/300)^1.85, fitted over 200-500 K to about 2 %.
        nc: PowerLaw {
            at_300k_cm3: 2.86e19,
            exponent: 1.58,
        },
        nv: PowerLaw {
            at_300k_cm3: 3.10e19,
            exponent: 1.85,
        },
        // Source: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), Appendix G: 11.9 (from memory).
        relative_permittivity: 11.9,
        dopants: vec![
            // Source: Sze 1981, ch. 1, measured ionization energies in Si:
            // P 45, As 54, Sb 39 meV (donors); B 45, Al 67, Ga 72, In 160 meV (acceptors).
            // Source: Altermatt et al., J. Appl. Phys. 100, 113714 and 113715 (2006), Table 1:
            // the density-dependent sets of P, As and B (see crate::ionization).
            with_altermatt(
                dopant("P", Donor, 45.0, SZE),
                params::ALTERMATT_SI_PHOSPHORUS,
            ),
            with_altermatt(dopant("As", Donor, 54.0, SZE), params::ALTERMATT_SI_ARSENIC),
            dopant("Sb", Donor, 39.0, SZE),
            with_altermatt(dopant("B", Acceptor, 45.0, SZE), params::ALTERMATT_SI_BORON),
            dopant("Al", Acceptor, 67.0, SZE),
            dopant("Ga", Acceptor, 72.0, SZE),
            dopant("In", Acceptor, 160.0, SZE),
        ],
        sources: MaterialSources {
            band_gap: "Thurmond1975: Thurmond, J. Electrochem. Soc. 122, 1133 (1975)".into(),
            density_of_states: "Green1990: Green, J. Appl. Phys. 67, 2944 (1990); \
                                Nc 2.86e19 T^1.58, Nv 3.10e19 T^1.85, 200-500 K"
                .into(),
            permittivity: "Sze1981: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), \
                           Appendix G (from memory)"
                .into(),
        },
        // Source: Pearson & Bardeen, Phys. Rev. 75, 865 (1949) form; alpha 3.1e-8 eV cm
        // (donors), 3.037e-8 eV cm (acceptors): widely used defaults (from memory).
        pearson_bardeen: Some(params::PEARSON_BARDEEN_SILICON),
        intrinsic_fit: Some(params::misiakos_tsamakis_1993()),
        band_gap_narrowing: Some(params::slotboom_de_graaff_1977()),
    }
}

/// Germanium.
pub fn germanium() -> Material {
    use DopantKind::{Acceptor, Donor};
    const SZE: &str = "Sze1981: measured ionization energies in Ge (Sze, Physics of Semiconductor \
                       Devices, 2nd ed., 1981, ch. 1) (from memory); g: common practice";
    Material {
        id: "ge".into(),
        name: "Germanium".into(),
        // Source: Thurmond, J. Electrochem. Soc. 122, 1133 (1975): alpha = 4.774e-4 eV/K,
        // beta = 235 K; Eg0 = 0.7437 eV (from memory).
        varshni: Varshni {
            eg0_ev: 0.7437,
            alpha_ev_per_k: 4.774e-4,
            beta_k: 235.0,
        },
        // Source: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), Appendix G:
        // Nc = 1.04e19, Nv = 6.0e18 at 300 K, T^1.5 (from memory).
        nc: PowerLaw {
            at_300k_cm3: 1.04e19,
            exponent: 1.5,
        },
        nv: PowerLaw {
            at_300k_cm3: 6.0e18,
            exponent: 1.5,
        },
        // Source: Sze 1981, Appendix G: 16.0 (from memory).
        relative_permittivity: 16.0,
        dopants: vec![
            // Source: Sze 1981, ch. 1, measured ionization energies in Ge (from memory):
            // P 12.0, As 12.7, Sb 9.6 meV (donors); B 10.4, Al 10.2, Ga 10.8, In 11.2 meV (acceptors).
            dopant("P", Donor, 12.0, SZE),
            dopant("As", Donor, 12.7, SZE),
            dopant("Sb", Donor, 9.6, SZE),
            dopant("B", Acceptor, 10.4, SZE),
            dopant("Al", Acceptor, 10.2, SZE),
            dopant("Ga", Acceptor, 10.8, SZE),
            dopant("In", Acceptor, 11.2, SZE),
        ],
        sources: MaterialSources {
            band_gap: "Thurmond1975: Thurmond, J. Electrochem. Soc. 122, 1133 (1975) \
                       (alpha, beta; Eg0 from memory)"
                .into(),
            density_of_states: "Sze1981: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), \
                                Appendix G, T^1.5 (from memory)"
                .into(),
            permittivity: "Sze1981: Appendix G (from memory)".into(),
        },
        pearson_bardeen: None,
        intrinsic_fit: None,
        band_gap_narrowing: None,
    }
}

/// Gallium arsenide (direct Gamma gap).
pub fn gallium_arsenide() -> Material {
    use DopantKind::{Acceptor, Donor};
    const DOPANT_LEVELS: &str = "Sze1981: measured ionization energies in GaAs (Sze, Physics of \
                             Semiconductor Devices, 2nd ed., 1981, ch. 1) (from memory); \
                             g: common practice";
    Material {
        id: "gaas".into(),
        name: "Gallium arsenide".into(),
        // Source: Vurgaftman, Meyer, Ram-Mohan, J. Appl. Phys. 89, 5815 (2001), Table III:
        // Eg0 = 1.519 eV, alpha = 0.5405 meV/K, beta = 204 K (Gamma valley).
        varshni: Varshni {
            eg0_ev: 1.519,
            alpha_ev_per_k: 5.405e-4,
            beta_k: 204.0,
        },
        // Source: Sze 1981, Appendix G: Nc = 4.7e17, Nv = 7.0e18 at 300 K, T^1.5 (from memory).
        nc: PowerLaw {
            at_300k_cm3: 4.7e17,
            exponent: 1.5,
        },
        nv: PowerLaw {
            at_300k_cm3: 7.0e18,
            exponent: 1.5,
        },
        // Source: Sze 1981, Appendix G: 13.1 (from memory).
        relative_permittivity: 13.1,
        dopants: vec![
            // Source: Sze 1981, ch. 1, GaAs (from memory): Si on a Ga site 5.8 meV,
            // Te 5.8 meV (shallow hydrogen-like donors); C 26, Be 28, Mg 28, Zn 31 meV.
            dopant("Si", Donor, 5.8, DOPANT_LEVELS),
            dopant("Te", Donor, 5.8, DOPANT_LEVELS),
            dopant("C", Acceptor, 26.0, DOPANT_LEVELS),
            dopant("Be", Acceptor, 28.0, DOPANT_LEVELS),
            dopant("Mg", Acceptor, 28.0, DOPANT_LEVELS),
            dopant("Zn", Acceptor, 31.0, DOPANT_LEVELS),
        ],
        sources: MaterialSources {
            band_gap: "Vurgaftman2001: Vurgaftman, Meyer, Ram-Mohan, J. Appl. Phys. 89, 5815 \
                       (2001), Table III"
                .into(),
            density_of_states: "Sze1981: Sze, Physics of Semiconductor Devices, 2nd ed. (1981), \
                                Appendix G, T^1.5 (from memory)"
                .into(),
            permittivity: "Sze1981: Appendix G (from memory)".into(),
        },
        pearson_bardeen: None,
        intrinsic_fit: None,
        band_gap_narrowing: None,
    }
}

/// Gallium nitride, wurtzite.
pub fn gallium_nitride() -> Material {
    use DopantKind::{Acceptor, Donor};
    const DOPANTS: &str = "Levinshtein2001: Levinshtein, Rumyantsev, Shur (eds.), Properties of \
                           Advanced Semiconductor Materials (Wiley, 2001), GaN chapter \
                           (from memory); g: common practice";
    Material {
        id: "gan".into(),
        name: "Gallium nitride (wurtzite)".into(),
        // Source: Vurgaftman & Meyer, in Piprek (ed.), Nitride Semiconductor Devices
        // (Wiley-VCH, 2007), ch. 2: Eg0 = 3.510 eV, alpha = 0.914 meV/K, beta = 825 K.
        varshni: Varshni {
            eg0_ev: 3.510,
            alpha_ev_per_k: 9.14e-4,
            beta_k: 825.0,
        },
        // Source: Levinshtein et al. 2001, GaN: Nc = 2.3e18, Nv = 4.6e19 cm^-3 at
        // 300 K with T^1.5 (from memory).
        nc: PowerLaw {
            at_300k_cm3: 2.3e18,
            exponent: 1.5,
        },
        nv: PowerLaw {
            at_300k_cm3: 4.6e19,
            exponent: 1.5,
        },
        // Source: Levinshtein et al. 2001, GaN: static 8.9 (from memory).
        relative_permittivity: 8.9,
        dopants: vec![
            // Source: Levinshtein et al. 2001 (from memory): Si donor about 15 meV,
            // Mg acceptor about 160 meV.
            dopant("Si", Donor, 15.0, DOPANTS),
            dopant("Mg", Acceptor, 160.0, DOPANTS),
        ],
        sources: MaterialSources {
            band_gap: "VurgaftmanMeyer2007: Vurgaftman & Meyer, in Piprek (ed.), Nitride \
                       Semiconductor Devices (2007), ch. 2"
                .into(),
            density_of_states: "Levinshtein2001: Levinshtein, Rumyantsev, Shur (eds.), \
                                Properties of Advanced Semiconductor Materials (2001), T^1.5 \
                                (from memory)"
                .into(),
            permittivity: "Levinshtein2001 (from memory)".into(),
        },
        pearson_bardeen: None,
        intrinsic_fit: None,
        band_gap_narrowing: None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_builtin_material_validates() {
        for m in builtin() {
            assert_eq!(m.validate(), Ok(()), "{}", m.id);
        }
    }

    #[test]
    fn lookup_is_case_insensitive() {
        assert_eq!(by_id("GaAs").map(|m| m.id), Ok("gaas".to_owned()));
        assert_eq!(silicon().dopant("b").map(|d| d.symbol), Ok("B".into()));
        assert!(matches!(
            by_id("unobtainium"),
            Err(MaterialError::UnknownMaterial { .. })
        ));
    }

    #[test]
    fn wrong_kind_is_refused_with_both_kinds_named() {
        let e = silicon()
            .dopant_of_kind("B", DopantKind::Donor)
            .unwrap_err();
        assert_eq!(e.to_string(), "dopant: B in si is an acceptor, not a donor");
        let e = silicon()
            .dopant_of_kind("P", DopantKind::Acceptor)
            .unwrap_err();
        assert_eq!(e.to_string(), "dopant: P in si is a donor, not an acceptor");
    }

    #[test]
    fn bad_parameters_are_named() {
        let mut m = silicon();
        m.nv.at_300k_cm3 = -1.0;
        let e = m.validate().unwrap_err();
        assert_eq!(
            e.to_string(),
            "material si: nv.at_300k_cm3: -1 is not allowed; give a finite value > 0 cm^-3"
        );
        let e = Dopant::new("X", DopantKind::Donor, 0.05, f64::NAN, "demo").unwrap_err();
        assert!(e.to_string().starts_with("dopant X: degeneracy: NaN"));
    }
}
