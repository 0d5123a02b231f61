//! Resistivity <-> density by any applicable model, and every applicable model side by side
//! with the spread between them.
//!
//! # Public API
//! - [`ConversionModel`]: the empirical 23 C relation (id `"thurber"`) or the physics model with
//!   a mobility model (ids `"masetti"`, `"arora"`, `"caughey-thomas"`, `"lattice"`);
//!   [`ConversionModel::applicable`], [`ConversionModel::default_for`].
//! - [`ConversionInput`]: a resistivity or a density.
//! - [`convert`]: one model, one answer, as a [`Conversion`].
//! - [`compare`]: every applicable model, as a [`Comparison`] of [`ModelAnswer`]s with the
//!   [`Spread`] (largest over smallest) over the models that convert doped material (the
//!   lattice-only mobility, which ignores impurity scattering, is listed but not counted).
//! - [`ConversionError`]: refusals, naming the field, the value and the allowed range.

use std::fmt;

use serde::{Serialize, Serializer};

use crate::empirical::{
    self, EMPIRICAL_TEMPERATURE_K, EmpiricalError, EmpiricalInput, EmpiricalRelation,
};
use crate::materials::{DopantKind, Material, MaterialError};
use crate::mobility::{ConductivityType, MobilityModel};
use crate::neutrality::{CarrierError, SolveOptions};
use crate::resistivity::{self, PhysicsOptions, ResistivityError, ResistivityPoint};

/// How far (K) from 23 C a temperature may be for the empirical relation to be used as is:
/// within 1 K the resistivity of lightly doped silicon changes by under 1 % (the lattice
/// mobility goes as T^-2.5, 0.84 %/K at 296 K), well inside the relation's own 3-4.5 %
/// self-consistency. This tolerance is this project's choice, not the standard's.
pub const EMPIRICAL_TEMPERATURE_TOLERANCE_K: f64 = 1.0;

/// Id of the empirical relation.
const EMPIRICAL_ID: &str = "thurber";

/// A resistivity <-> density conversion model.
#[non_exhaustive]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ConversionModel {
    /// The empirical relations of Thurber et al. (ASTM F723), silicon, 23 C.
    Empirical,
    /// Carrier statistics plus a mobility model, at any temperature the models allow.
    Physics(MobilityModel),
}

impl Serialize for ConversionModel {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.serialize_str(self.id())
    }
}

impl fmt::Display for ConversionModel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.id())
    }
}

impl ConversionModel {
    /// Every model, in the order a comparison lists them.
    pub fn all() -> Vec<ConversionModel> {
        std::iter::once(ConversionModel::Empirical)
            .chain(MobilityModel::ALL.into_iter().map(ConversionModel::Physics))
            .collect()
    }

    /// Stable id: "thurber" for the empirical relation, the mobility model's id otherwise.
    pub fn id(&self) -> &'static str {
        match self {
            ConversionModel::Empirical => EMPIRICAL_ID,
            ConversionModel::Physics(m) => m.id(),
        }
    }

    /// The model with id `id` (case-insensitive).
    ///
    /// # Errors
    /// [`ConversionError::UnknownModel`] listing the ids.
    pub fn from_id(id: &str) -> Result<ConversionModel, ConversionError> {
        ConversionModel::all()
            .into_iter()
            .find(|m| m.id().eq_ignore_ascii_case(id.trim()))
            .ok_or_else(|| ConversionError::UnknownModel { id: id.to_string() })
    }

    /// Human-readable name.
    pub fn name(&self) -> String {
        match self {
            ConversionModel::Empirical => {
                "Thurber et al. empirical relation (ASTM F723), 23 C".to_string()
            }
            ConversionModel::Physics(m) => {
                format!("charge neutrality + {} mobility", m.name())
            }
        }
    }

    /// Whether the model covers `material_id` doped with `dopant_symbol`.
    pub fn applicable(&self, material_id: &str, dopant_symbol: &str) -> bool {
        match self {
            ConversionModel::Empirical => EmpiricalRelation::applicable(material_id, dopant_symbol),
            ConversionModel::Physics(m) => m.applicable(material_id, dopant_symbol),
        }
    }

    /// The model to use when the user names none: the empirical relation for silicon within
    /// [`EMPIRICAL_TEMPERATURE_TOLERANCE_K`] of 23 C (it is the standard practice), else the
    /// first applicable physics model (Masetti, Arora, Caughey-Thomas) whose temperature range
    /// holds `temperature_k`. `None` when nothing applies.
    pub fn default_for(
        material_id: &str,
        dopant_symbol: &str,
        temperature_k: f64,
    ) -> Option<ConversionModel> {
        if near_23c(temperature_k) && EmpiricalRelation::applicable(material_id, dopant_symbol) {
            return Some(ConversionModel::Empirical);
        }
        default_physics(material_id, dopant_symbol, temperature_k).map(ConversionModel::Physics)
    }
}

/// The first impurity-aware physics mobility model for this material, dopant and temperature.
pub(crate) fn default_physics(
    material_id: &str,
    dopant_symbol: &str,
    temperature_k: f64,
) -> Option<MobilityModel> {
    [
        MobilityModel::Masetti,
        MobilityModel::Arora,
        MobilityModel::CaugheyThomas,
    ]
    .into_iter()
    .find(|m| {
        m.applicable(material_id, dopant_symbol)
            && m.temperature_range_k(material_id)
                .is_some_and(|(lo, hi)| (lo..=hi).contains(&temperature_k))
    })
}

fn near_23c(temperature_k: f64) -> bool {
    (temperature_k - EMPIRICAL_TEMPERATURE_K).abs() <= EMPIRICAL_TEMPERATURE_TOLERANCE_K
}

/// What is converted.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ConversionInput {
    /// A resistivity in ohm cm, converted to density.
    ResistivityOhmCm(f64),
    /// A dopant density in cm^-3, converted to resistivity.
    DensityCm3(f64),
}

impl ConversionInput {
    /// The given value.
    pub fn value(&self) -> f64 {
        match self {
            ConversionInput::ResistivityOhmCm(v) | ConversionInput::DensityCm3(v) => *v,
        }
    }

    /// Name of the computed quantity: "density_cm3" or "resistivity_ohm_cm".
    pub fn output_name(&self) -> &'static str {
        match self {
            ConversionInput::ResistivityOhmCm(_) => "density_cm3",
            ConversionInput::DensityCm3(_) => "resistivity_ohm_cm",
        }
    }
}

/// Why a conversion was refused.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum ConversionError {
    /// No model has this id.
    UnknownModel {
        /// The id given.
        id: String,
    },
    /// The model does not cover this material and dopant.
    NotApplicable {
        /// Model id.
        model: &'static str,
        /// Material id.
        material_id: String,
        /// Dopant symbol.
        dopant: String,
    },
    /// No model covers this material and dopant.
    NoApplicableModel {
        /// Material id.
        material_id: String,
        /// Dopant symbol.
        dopant: String,
    },
    /// The dopant is not known for the material.
    Dopant(MaterialError),
    /// The empirical relation is for 23 C and the temperature is too far from it.
    EmpiricalTemperature {
        /// Temperature given, K.
        temperature_k: f64,
    },
    /// The empirical relation refused.
    Empirical(EmpiricalError),
    /// The physics model refused.
    Physics(ResistivityError),
}

impl fmt::Display for ConversionError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ConversionError::UnknownModel { id } => {
                let ids: Vec<&str> = ConversionModel::all().iter().map(|m| m.id()).collect();
                write!(
                    f,
                    "model: '{id}' is not known; use one of {}",
                    ids.join(", ")
                )
            }
            ConversionError::NotApplicable {
                model,
                material_id,
                dopant,
            } => write!(
                f,
                "model: {model} does not cover dopant '{dopant}' in material '{material_id}'; \
                 choose another model"
            ),
            ConversionError::NoApplicableModel {
                material_id,
                dopant,
            } => write!(
                f,
                "dopant: no conversion model covers '{dopant}' in material '{material_id}'"
            ),
            ConversionError::Dopant(e) => e.fmt(f),
            ConversionError::EmpiricalTemperature { temperature_k } => write!(
                f,
                "temperature_k: {temperature_k} is not allowed for the empirical relation, which \
                 holds at 23 C; give {:.2} to {:.2} K, correct the reading to 23 C first, or \
                 choose a physics model",
                EMPIRICAL_TEMPERATURE_K - EMPIRICAL_TEMPERATURE_TOLERANCE_K,
                EMPIRICAL_TEMPERATURE_K + EMPIRICAL_TEMPERATURE_TOLERANCE_K
            ),
            ConversionError::Empirical(e) => e.fmt(f),
            ConversionError::Physics(e) => e.fmt(f),
        }
    }
}

impl std::error::Error for ConversionError {}

/// One conversion.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Conversion {
    /// Model id.
    pub model: ConversionModel,
    /// Model name.
    pub model_name: String,
    /// n or p.
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Dopant density, cm^-3 (given or computed).
    pub density_cm3: f64,
    /// Resistivity, ohm cm (given or computed).
    pub resistivity_ohm_cm: f64,
    /// Temperature the answer holds at, K (296.15 for the empirical relation).
    pub temperature_k: f64,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
    /// Carriers, mobilities and ionization, for the physics models.
    pub physics: Option<ResistivityPoint>,
}

/// Converts `input` for `dopant_symbol` in `material` at `temperature_k` with `model`.
///
/// # Formula
/// Empirical: [`empirical::convert`]. Physics: [`resistivity::density_from_resistivity`] or
/// [`resistivity::resistivity_from_density`].
///
/// # Validity
/// The model's. The empirical relation is used only within
/// [`EMPIRICAL_TEMPERATURE_TOLERANCE_K`] of 23 C; a note states any difference from 23 C.
///
/// # Errors
/// [`ConversionError::Dopant`], [`ConversionError::NotApplicable`],
/// [`ConversionError::EmpiricalTemperature`], [`ConversionError::Empirical`],
/// [`ConversionError::Physics`].
pub fn convert(
    material: &Material,
    dopant_symbol: &str,
    input: ConversionInput,
    temperature_k: f64,
    model: ConversionModel,
    solve: &SolveOptions,
) -> Result<Conversion, ConversionError> {
    let dopant = material
        .dopant(dopant_symbol)
        .map_err(ConversionError::Dopant)?;
    if !model.applicable(&material.id, &dopant.symbol) {
        return Err(ConversionError::NotApplicable {
            model: model.id(),
            material_id: material.id.clone(),
            dopant: dopant.symbol.to_string(),
        });
    }
    let conductivity_type = match dopant.kind {
        DopantKind::Donor => ConductivityType::N,
        DopantKind::Acceptor => ConductivityType::P,
    };
    match model {
        ConversionModel::Empirical => {
            if !(temperature_k.is_finite() && near_23c(temperature_k)) {
                return Err(ConversionError::EmpiricalTemperature { temperature_k });
            }
            let e_input = match input {
                ConversionInput::ResistivityOhmCm(v) => EmpiricalInput::ResistivityOhmCm(v),
                ConversionInput::DensityCm3(v) => EmpiricalInput::DensityCm3(v),
            };
            let e = empirical::convert(&material.id, &dopant.symbol, e_input)
                .map_err(ConversionError::Empirical)?;
            let mut notes = e.notes;
            if temperature_k != EMPIRICAL_TEMPERATURE_K {
                notes.push(format!(
                    "relation holds at 23 C; the given {temperature_k} K differs by {:+.2} K and \
                     is not corrected for",
                    temperature_k - EMPIRICAL_TEMPERATURE_K
                ));
            }
            Ok(Conversion {
                model,
                model_name: model.name(),
                conductivity_type,
                density_cm3: e.density_cm3,
                resistivity_ohm_cm: e.resistivity_ohm_cm,
                temperature_k: EMPIRICAL_TEMPERATURE_K,
                notes,
                physics: None,
            })
        }
        ConversionModel::Physics(mobility) => {
            let options = PhysicsOptions {
                mobility,
                solve: solve.clone(),
            };
            let point = match input {
                ConversionInput::ResistivityOhmCm(v) => resistivity::density_from_resistivity(
                    material,
                    &dopant.symbol,
                    v,
                    temperature_k,
                    &options,
                ),
                ConversionInput::DensityCm3(v) => resistivity::resistivity_from_density(
                    material,
                    &dopant.symbol,
                    v,
                    temperature_k,
                    &options,
                ),
            }
            .map_err(ConversionError::Physics)?;
            Ok(Conversion {
                model,
                model_name: model.name(),
                conductivity_type,
                density_cm3: point.density_cm3,
                resistivity_ohm_cm: point.resistivity_ohm_cm,
                temperature_k,
                notes: point.notes.clone(),
                physics: Some(point),
            })
        }
    }
}

/// One model's answer in a comparison.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ModelAnswer {
    /// Model id.
    pub model: ConversionModel,
    /// Model name.
    pub model_name: String,
    /// Temperature the answer holds at, K.
    pub temperature_k: f64,
    /// Density, cm^-3 (`None` when the model refused).
    pub density_cm3: Option<f64>,
    /// Resistivity, ohm cm (`None` when the model refused).
    pub resistivity_ohm_cm: Option<f64>,
    /// Whether the answer counts in the spread: computed, at the requested temperature, and by a
    /// model that converts doped material (not the lattice-only mobility).
    pub in_spread: bool,
    /// Why the model refused, if it did.
    pub error: Option<String>,
    /// Remarks a reader must see.
    pub notes: Vec<String>,
}

/// Largest over smallest answer among the models in the spread.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Spread {
    /// The compared quantity: "density_cm3" or "resistivity_ohm_cm".
    pub quantity: &'static str,
    /// largest / smallest (>= 1).
    pub ratio: f64,
    /// Model with the smallest answer.
    pub lowest_model: ConversionModel,
    /// Smallest answer.
    pub lowest: f64,
    /// Model with the largest answer.
    pub highest_model: ConversionModel,
    /// Largest answer.
    pub highest: f64,
    /// Number of answers in the spread.
    pub models: usize,
}

/// Every applicable model's answer to one input.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Comparison {
    /// Material id.
    pub material_id: String,
    /// Dopant symbol.
    pub dopant: String,
    /// n or p.
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Requested temperature, K.
    pub temperature_k: f64,
    /// The input.
    pub input: ConversionInput,
    /// One entry per applicable model, in [`ConversionModel::all`] order.
    pub answers: Vec<ModelAnswer>,
    /// The spread, when at least two answers count.
    pub spread: Option<Spread>,
}

/// Every applicable model side by side for one input.
///
/// # Formula
/// Each model as in [`convert`]; spread = largest / smallest of the computed quantity over the
/// answers with `in_spread`.
///
/// # Validity
/// The empirical relation is always listed for silicon with B, P, As or Sb, evaluated at 23 C
/// and labelled so; it counts in the spread only when `temperature_k` is within
/// [`EMPIRICAL_TEMPERATURE_TOLERANCE_K`] of 23 C. The lattice-only mobility model
/// ([`MobilityModel::Lattice`]) ignores impurity scattering, so it is not a conversion model for
/// doped material: it is listed side by side (as the phonon limit) with a remark saying so, and
/// never counts in the spread. A model that refuses the input (range, temperature) is listed
/// with its reason and does not count.
///
/// # Errors
/// [`ConversionError::Dopant`]; [`ConversionError::NoApplicableModel`] when no model covers the
/// material and dopant; [`ConversionError::Physics`] when the value or the temperature is
/// refused by every model alike (not finite, or not > 0; a density may be 0).
pub fn compare(
    material: &Material,
    dopant_symbol: &str,
    input: ConversionInput,
    temperature_k: f64,
    solve: &SolveOptions,
) -> Result<Comparison, ConversionError> {
    let dopant = material
        .dopant(dopant_symbol)
        .map_err(ConversionError::Dopant)?;
    // A value or temperature that no model can take is refused once, rather than listed as
    // every model's refusal in a comparison that would echo the NaN or infinity.
    let invalid_input = match input {
        ConversionInput::ResistivityOhmCm(v) if !(v.is_finite() && v > 0.0) => {
            Some(ResistivityError::InvalidResistivity { value_ohm_cm: v })
        }
        ConversionInput::DensityCm3(v) if !(v.is_finite() && v >= 0.0) => {
            Some(ResistivityError::InvalidDensity { value_cm3: v })
        }
        _ => None,
    };
    let invalid = invalid_input.or_else(|| {
        (!(temperature_k.is_finite() && temperature_k > 0.0)).then_some(ResistivityError::Carriers(
            CarrierError::InvalidTemperature {
                value: temperature_k,
            },
        ))
    });
    if let Some(error) = invalid {
        return Err(ConversionError::Physics(error));
    }
    let models: Vec<ConversionModel> = ConversionModel::all()
        .into_iter()
        .filter(|m| m.applicable(&material.id, &dopant.symbol))
        .collect();
    if models.is_empty() {
        return Err(ConversionError::NoApplicableModel {
            material_id: material.id.clone(),
            dopant: dopant.symbol.to_string(),
        });
    }
    let answers: Vec<ModelAnswer> = models
        .into_iter()
        .map(|model| answer(material, &dopant.symbol, input, temperature_k, model, solve))
        .collect();
    let spread = spread(&answers, input);
    Ok(Comparison {
        material_id: material.id.clone(),
        dopant: dopant.symbol.to_string(),
        conductivity_type: match dopant.kind {
            DopantKind::Donor => ConductivityType::N,
            DopantKind::Acceptor => ConductivityType::P,
        },
        temperature_k,
        input,
        answers,
        spread,
    })
}

fn answer(
    material: &Material,
    dopant: &str,
    input: ConversionInput,
    temperature_k: f64,
    model: ConversionModel,
    solve: &SolveOptions,
) -> ModelAnswer {
    let at_requested = model != ConversionModel::Empirical || near_23c(temperature_k);
    let evaluated_at = if at_requested {
        temperature_k
    } else {
        EMPIRICAL_TEMPERATURE_K
    };
    let converts_doped = model != ConversionModel::Physics(MobilityModel::Lattice);
    let mut notes = Vec::new();
    if !at_requested {
        notes.push(format!(
            "evaluated at 23 C (296.15 K), where the relation holds; not in the spread at \
             {temperature_k} K"
        ));
    }
    if !converts_doped {
        notes.push(
            "lattice-only mobility ignores impurity scattering, so it is not a conversion model \
             for doped material: shown as the phonon limit, not in the spread"
                .to_string(),
        );
    }
    match convert(material, dopant, input, evaluated_at, model, solve) {
        Ok(c) => {
            notes.extend(c.notes);
            ModelAnswer {
                model,
                model_name: c.model_name,
                temperature_k: c.temperature_k,
                density_cm3: Some(c.density_cm3),
                resistivity_ohm_cm: Some(c.resistivity_ohm_cm),
                in_spread: at_requested && converts_doped,
                error: None,
                notes,
            }
        }
        Err(e) => ModelAnswer {
            model,
            model_name: model.name(),
            temperature_k: evaluated_at,
            density_cm3: None,
            resistivity_ohm_cm: None,
            in_spread: false,
            error: Some(e.to_string()),
            notes,
        },
    }
}

fn spread(answers: &[ModelAnswer], input: ConversionInput) -> Option<Spread> {
    let values: Vec<(ConversionModel, f64)> = answers
        .iter()
        .filter(|a| a.in_spread)
        .filter_map(|a| {
            let v = match input {
                ConversionInput::ResistivityOhmCm(_) => a.density_cm3,
                ConversionInput::DensityCm3(_) => a.resistivity_ohm_cm,
            };
            v.map(|v| (a.model, v))
        })
        .collect();
    if values.len() < 2 {
        return None;
    }
    let lowest = values.iter().copied().min_by(|a, b| a.1.total_cmp(&b.1))?;
    let highest = values.iter().copied().max_by(|a, b| a.1.total_cmp(&b.1))?;
    Some(Spread {
        quantity: input.output_name(),
        ratio: highest.1 / lowest.1,
        lowest_model: lowest.0,
        lowest: lowest.1,
        highest_model: highest.0,
        highest: highest.1,
        models: values.len(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_value_or_temperature_no_model_takes_is_refused_once() {
        let si = crate::materials::silicon();
        let options = SolveOptions::default();
        let refused = |input, t| compare(&si, "B", input, t, &options).map(|_| ());
        for t in [f64::NAN, f64::INFINITY, 0.0, -1.0] {
            let result = refused(ConversionInput::DensityCm3(1e15), t);
            assert!(
                matches!(result, Err(ConversionError::Physics(ResistivityError::Carriers(
                    CarrierError::InvalidTemperature { value }
                ))) if value.to_bits() == t.to_bits()),
                "{t}: {result:?}"
            );
        }
        let rho = refused(ConversionInput::ResistivityOhmCm(f64::NAN), 300.0);
        assert!(
            matches!(rho, Err(ConversionError::Physics(ResistivityError::InvalidResistivity { value_ohm_cm })) if value_ohm_cm.is_nan()),
            "{rho:?}"
        );
        assert_eq!(
            refused(ConversionInput::DensityCm3(-1.0), 300.0),
            Err(ConversionError::Physics(ResistivityError::InvalidDensity {
                value_cm3: -1.0
            }))
        );
        // A density of 0 is the physics models' to answer (intrinsic material).
        assert!(refused(ConversionInput::DensityCm3(0.0), 300.0).is_ok());
    }

    #[test]
    fn ids_round_trip_and_are_unique() {
        let all = ConversionModel::all();
        for m in &all {
            assert_eq!(ConversionModel::from_id(m.id()).as_ref(), Ok(m));
        }
        let mut ids: Vec<&str> = all.iter().map(|m| m.id()).collect();
        ids.sort_unstable();
        ids.dedup();
        assert_eq!(ids.len(), all.len());
    }

    #[test]
    fn default_model_choice() {
        assert_eq!(
            ConversionModel::default_for("si", "B", 296.15),
            Some(ConversionModel::Empirical)
        );
        assert_eq!(
            ConversionModel::default_for("si", "B", 350.0),
            Some(ConversionModel::Physics(MobilityModel::Masetti))
        );
        assert_eq!(
            ConversionModel::default_for("si", "Ga", 296.15),
            Some(ConversionModel::Physics(MobilityModel::Arora))
        );
        assert_eq!(ConversionModel::default_for("ge", "P", 300.0), None);
    }

    #[test]
    fn json_names_the_model_and_type() {
        let si = crate::materials::silicon();
        let c = convert(
            &si,
            "B",
            ConversionInput::ResistivityOhmCm(10.0),
            296.15,
            ConversionModel::Empirical,
            &SolveOptions::default(),
        )
        .unwrap();
        let json = serde_json::to_value(&c).unwrap();
        assert_eq!(json["model"], "thurber");
        assert_eq!(json["type"], "p");
        assert!(json["density_cm3"].as_f64().unwrap() > 1e15);
    }

    #[test]
    fn germanium_has_no_model_and_says_so() {
        let ge = crate::materials::germanium();
        let err = compare(
            &ge,
            "P",
            ConversionInput::DensityCm3(1e16),
            300.0,
            &SolveOptions::default(),
        )
        .unwrap_err();
        assert!(matches!(err, ConversionError::NoApplicableModel { .. }));
        assert!(err.to_string().contains("dopant"), "{err}");
    }
}
