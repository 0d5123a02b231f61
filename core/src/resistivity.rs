//! Resistivity from dopant density through carrier statistics and mobility, and its inverse.
//!
//! # Public API
//! - [`PhysicsOptions`]: the mobility model and the neutrality-solver options.
//! - [`resistivity_from_density`]: rho(N, T) = 1/(q (n mu_n + p mu_p)) with n, p from
//!   [`crate::neutrality::solve`] (Fermi-Dirac, incomplete ionization with the selected
//!   [`crate::ionization::IonizationModel`]) and the mobilities at the total ionized-impurity
//!   density; returns a [`ResistivityPoint`] with every intermediate.
//! - [`resistivity_of_mix`]: the same for any mix of donors and acceptors, one neutrality solve,
//!   mobility at N_D+ + N_A- with the parameter set of the species [`mobility_species`] picks;
//!   returns a [`MixResistivity`].
//! - [`density_from_resistivity`]: the inverse for one dopant, by bracketed Brent iteration in
//!   ln N; the round trip rho -> N -> rho agrees to 1e-9 relative (checked before returning).
//! - [`reachable_range`]: the lowest and highest resistivity the model can give for a dopant at
//!   a temperature, as a [`ReachableRange`].
//! - [`ResistivityError`]: every refusal, naming the field, the value and the limit.

use std::fmt;

use serde::Serialize;

use crate::constants::ELEMENTARY_CHARGE_C;
use crate::ionization::IonizationModel;
use crate::materials::{Dopant, DopantDensity, DopantKind, Material, MaterialError};
use crate::mobility::{self, ConductivityType, MobilityError, MobilityModel};
use crate::neutrality::{self, CarrierError, Equilibrium, ModelUsed, Regime, SolveOptions};

/// Relative agreement guaranteed for the round trip rho -> N -> rho.
pub const ROUND_TRIP_TOLERANCE: f64 = 1e-9;

/// |ln rho(N) - ln rho_target| at which the inversion stops: 100 times below the guarantee and
/// about 10 times above the noise of the neutrality solve (relative charge residual 1e-12).
const LN_RHO_TOLERANCE: f64 = 1e-11;
/// Bracket width in ln N at which the inversion stops (far below any physical meaning).
const LN_DENSITY_TOLERANCE: f64 = 1e-13;
/// Iteration limit of the Brent search (it needs about 10; bisection alone needs under 200).
const MAX_BRENT_ITERATIONS: usize = 200;
/// Lowest density searched, as a fraction of ni, when doping has no resistivity maximum: there
/// rho differs from the intrinsic resistivity by about this fraction.
const FLOOR_FRACTION_OF_NI: f64 = 1e-6;
/// Ionized fraction of the dopant below which a result carries a note saying how much is
/// ionized (a tenth or more of the dopant neutral changes rho visibly).
pub const INCOMPLETE_IONIZATION_NOTE_FRACTION: f64 = 0.9;
/// Relative rounding of exp(ln N) for |ln N| < 60: a few ulp of ln N, times |ln N|.
const EXP_LN_ROUNDING: f64 = 1e-13;
/// Half-width in ln N of the look either side of a failed inversion for a step in rho(N).
const STEP_PROBE_LN_DENSITY: f64 = 1e-9;

/// Model choices of the physics-based conversion.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PhysicsOptions {
    /// Mobility model.
    pub mobility: MobilityModel,
    /// Neutrality-solver options (intrinsic-density model, band-gap narrowing).
    pub solve: SolveOptions,
}

impl PhysicsOptions {
    /// The given mobility model with default solver options.
    pub fn with_mobility(mobility: MobilityModel) -> PhysicsOptions {
        PhysicsOptions {
            mobility,
            solve: SolveOptions::default(),
        }
    }
}

/// One evaluated state: doping, temperature, carriers, mobilities and resistivity.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ResistivityPoint {
    /// Material id.
    pub material_id: String,
    /// Dopant symbol.
    pub dopant: String,
    /// n (donor) or p (acceptor).
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Dopant density, cm^-3.
    pub density_cm3: f64,
    /// Temperature, K.
    pub temperature_k: f64,
    /// Resistivity, ohm cm.
    pub resistivity_ohm_cm: f64,
    /// Free electrons, cm^-3.
    pub electrons_cm3: f64,
    /// Free holes, cm^-3.
    pub holes_cm3: f64,
    /// Ionized dopants N_D+ + N_A-, cm^-3 (the density the mobility is evaluated at).
    pub ionized_impurity_cm3: f64,
    /// Ionized fraction of the dopant.
    pub ionized_fraction: f64,
    /// Intrinsic density of the selected model, cm^-3.
    pub intrinsic_cm3: f64,
    /// Electron mobility, cm^2/V s.
    pub electron_mobility_cm2_per_v_s: f64,
    /// Hole mobility, cm^2/V s.
    pub hole_mobility_cm2_per_v_s: f64,
    /// Mobility model used.
    pub mobility_model: MobilityModel,
    /// Parameter sets used (electrons, holes).
    pub mobility_parameters: [&'static str; 2],
    /// Conduction regime from the neutrality solve.
    pub regime: Regime,
    /// Fermi level within 3 kT of a band edge or beyond.
    pub degenerate: bool,
    /// Extensions, substitutions and range remarks a reader must see.
    pub notes: Vec<String>,
}

/// The resistivities a dopant can give at one temperature with one model.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct ReachableRange {
    /// Lowest resistivity, ohm cm, reached at the highest density the mobility model accepts.
    pub min_resistivity_ohm_cm: f64,
    /// That density, cm^-3.
    pub max_density_cm3: f64,
    /// Highest resistivity on the extrinsic branch, ohm cm.
    pub max_resistivity_ohm_cm: f64,
    /// The density searched down to, cm^-3: where doping stops raising the resistivity
    /// (acceptors in silicon, whose electrons are more mobile than holes) or 1e-6 ni.
    pub min_density_cm3: f64,
    /// Resistivity of undoped material, ohm cm.
    pub intrinsic_resistivity_ohm_cm: f64,
}

/// Why a physics-based conversion was refused.
#[non_exhaustive]
#[derive(Debug, Clone, PartialEq)]
pub enum ResistivityError {
    /// Resistivity not finite or not > 0.
    InvalidResistivity {
        /// Value given, ohm cm.
        value_ohm_cm: f64,
    },
    /// Density not finite or < 0.
    InvalidDensity {
        /// Value given, cm^-3.
        value_cm3: f64,
    },
    /// The dopant is not known for the material.
    Dopant(MaterialError),
    /// The mobility model refused (not applicable, density or temperature out of range).
    Mobility(MobilityError),
    /// The neutrality solve refused.
    Carriers(CarrierError),
    /// The resistivity is higher than the dopant can give at this temperature.
    AboveReachable {
        /// Value given, ohm cm.
        value_ohm_cm: f64,
        /// Highest reachable resistivity, ohm cm.
        max_ohm_cm: f64,
        /// Intrinsic resistivity, ohm cm.
        intrinsic_ohm_cm: f64,
        /// Temperature, K.
        temperature_k: f64,
    },
    /// The resistivity is lower than the model gives at its highest accepted density.
    BelowReachable {
        /// Value given, ohm cm.
        value_ohm_cm: f64,
        /// Lowest reachable resistivity, ohm cm.
        min_ohm_cm: f64,
        /// Density at which it is reached, cm^-3.
        max_density_cm3: f64,
        /// Mobility model.
        model: &'static str,
    },
    /// The resistivity falls in a step of rho(N): the Pearson-Bardeen level merges with the band
    /// at one density, where the dopant jumps to full ionization and rho drops.
    InIonizationStep {
        /// Value given, ohm cm.
        value_ohm_cm: f64,
        /// Density of the step, cm^-3.
        density_cm3: f64,
        /// Resistivity just below the step density, ohm cm.
        below_step_ohm_cm: f64,
        /// Resistivity just above the step density, ohm cm.
        above_step_ohm_cm: f64,
        /// The ionization model with the step.
        model: &'static str,
    },
    /// No species can carry the mobility parameter set: nothing listed and the material has no
    /// donor.
    NoMobilitySpecies {
        /// Material id.
        material_id: String,
    },
    /// The search did not meet the round-trip tolerance (not expected; please report).
    NotConverged {
        /// Target resistivity, ohm cm.
        value_ohm_cm: f64,
        /// Relative mismatch reached.
        mismatch: f64,
    },
}

impl fmt::Display for ResistivityError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ResistivityError::InvalidResistivity { value_ohm_cm } => write!(
                f,
                "resistivity_ohm_cm: {value_ohm_cm:e} is not allowed; give a finite value > 0 ohm cm"
            ),
            ResistivityError::InvalidDensity { value_cm3 } => write!(
                f,
                "density_cm3: {value_cm3:e} is not allowed; give a finite value >= 0 cm^-3"
            ),
            ResistivityError::Dopant(e) => e.fmt(f),
            ResistivityError::Mobility(e) => e.fmt(f),
            ResistivityError::Carriers(e) => e.fmt(f),
            ResistivityError::AboveReachable {
                value_ohm_cm,
                max_ohm_cm,
                intrinsic_ohm_cm,
                temperature_k,
            } => write!(
                f,
                "resistivity_ohm_cm: {value_ohm_cm:e} is above what this dopant gives at \
                 {temperature_k} K; give at most {max_ohm_cm:.4e} ohm cm (the intrinsic \
                 resistivity there is {intrinsic_ohm_cm:.4e} ohm cm)"
            ),
            ResistivityError::BelowReachable {
                value_ohm_cm,
                min_ohm_cm,
                max_density_cm3,
                model,
            } => {
                write!(
                    f,
                    "resistivity_ohm_cm: {value_ohm_cm:e} is below what the {model} model \
                     reaches; give at least {min_ohm_cm:.4e} ohm cm (its value at its highest \
                     density, {max_density_cm3:e} cm^-3)"
                )
            }
            ResistivityError::InIonizationStep {
                value_ohm_cm,
                density_cm3,
                below_step_ohm_cm,
                above_step_ohm_cm,
                model,
            } => write!(
                f,
                "resistivity_ohm_cm: {value_ohm_cm:e} falls in the step of the {model} ionization \
                 model at {density_cm3:.4e} cm^-3, where the dopant level merges with the band: \
                 the model gives {below_step_ohm_cm:.4e} ohm cm just below that density and \
                 {above_step_ohm_cm:.4e} just above, nothing between; give a value outside that \
                 gap or choose the dilute ionization model"
            ),
            ResistivityError::NoMobilitySpecies { material_id } => write!(
                f,
                "doping: no species listed and material {material_id} has no donor whose \
                 mobility parameters could be used; list at least one dopant"
            ),
            ResistivityError::NotConverged {
                value_ohm_cm,
                mismatch,
            } => write!(
                f,
                "resistivity_ohm_cm: the inversion for {value_ohm_cm:e} reached only a relative \
                 mismatch of {mismatch:e} (tolerance {ROUND_TRIP_TOLERANCE:e}); please report the input"
            ),
        }
    }
}

impl std::error::Error for ResistivityError {}

impl From<MobilityError> for ResistivityError {
    fn from(e: MobilityError) -> Self {
        ResistivityError::Mobility(e)
    }
}

impl From<CarrierError> for ResistivityError {
    fn from(e: CarrierError) -> Self {
        ResistivityError::Carriers(e)
    }
}

/// Everything fixed during one conversion; the doping vector is reused between evaluations.
struct Conversion<'a> {
    material: &'a Material,
    dopant: Dopant,
    doping: Vec<DopantDensity>,
    temperature_k: f64,
    options: &'a PhysicsOptions,
    /// The latest evaluation, reused when the answer is built at the same density.
    last: Option<(f64, State)>,
}

/// The numbers of one evaluation.
struct State {
    equilibrium: Equilibrium,
    mobilities: (f64, f64),
    resistivity_ohm_cm: f64,
}

impl<'a> Conversion<'a> {
    fn new(
        material: &'a Material,
        dopant_symbol: &str,
        temperature_k: f64,
        options: &'a PhysicsOptions,
    ) -> Result<Conversion<'a>, ResistivityError> {
        let dopant = material
            .dopant(dopant_symbol)
            .map_err(ResistivityError::Dopant)?;
        let model = options.mobility;
        if !model.applicable(&material.id, &dopant.symbol) {
            // Let the mobility module word the refusal.
            mobility::mobility(model, &material.id, &dopant.symbol, 0.0, temperature_k)?;
        }
        let doping = vec![DopantDensity {
            dopant: dopant.clone(),
            density_cm3: 0.0,
        }];
        Ok(Conversion {
            material,
            dopant,
            doping,
            temperature_k,
            options,
            last: None,
        })
    }

    fn conductivity_type(&self) -> ConductivityType {
        match self.dopant.kind {
            DopantKind::Donor => ConductivityType::N,
            DopantKind::Acceptor => ConductivityType::P,
        }
    }

    /// ln rho at `density_cm3`; the state is kept for [`Conversion::point`].
    fn ln_rho(&mut self, density_cm3: f64) -> Result<f64, ResistivityError> {
        let s = self.state(density_cm3)?;
        let ln_rho = s.resistivity_ohm_cm.ln();
        self.last = Some((density_cm3, s));
        Ok(ln_rho)
    }

    fn state(&mut self, density_cm3: f64) -> Result<State, ResistivityError> {
        // The searches work in ln N: exp(ln N_max) can round a few ulp above N_max, which a
        // fully ionized dopant then carries into the mobility model's range check. Only that
        // rounding is pulled back; anything further above is left for the models to refuse.
        let max = self.max_density_cm3();
        let density_cm3 = if density_cm3 > max && density_cm3 <= max * (1.0 + EXP_LN_ROUNDING) {
            max
        } else {
            density_cm3
        };
        self.doping[0].density_cm3 = density_cm3;
        let eq = neutrality::solve(
            self.material,
            self.temperature_k,
            &self.doping,
            &self.options.solve,
        )?;
        let ionized = eq.ionized_donors_cm3 + eq.ionized_acceptors_cm3;
        let (mu_n, mu_p) = mobility::mobility_values(
            self.options.mobility,
            &self.material.id,
            &self.dopant.symbol,
            ionized,
            self.temperature_k,
        )?;
        let sigma = ELEMENTARY_CHARGE_C * (eq.electrons_cm3 * mu_n + eq.holes_cm3 * mu_p);
        Ok(State {
            equilibrium: eq,
            mobilities: (mu_n, mu_p),
            resistivity_ohm_cm: 1.0 / sigma,
        })
    }

    /// The mobility of the majority carrier at `density_cm3` taken as fully ionized.
    fn majority_mobility(&self, density_cm3: f64) -> Result<f64, ResistivityError> {
        let (mu_n, mu_p) = mobility::mobility_values(
            self.options.mobility,
            &self.material.id,
            &self.dopant.symbol,
            density_cm3,
            self.temperature_k,
        )?;
        Ok(match self.dopant.kind {
            DopantKind::Donor => mu_n,
            DopantKind::Acceptor => mu_p,
        })
    }

    fn max_density_cm3(&self) -> f64 {
        self.options
            .mobility
            .max_density_cm3(&self.material.id, &self.dopant.symbol)
            .unwrap_or(neutrality::MAX_DENSITY_CM3)
            .min(neutrality::MAX_DENSITY_CM3)
    }

    /// Lowest density of the extrinsic branch, and whether a resistivity maximum exists there.
    ///
    /// When the minority carriers are the more mobile (acceptors in silicon), the first dopants
    /// raise the resistivity: with p - n = N, n p = ni^2 and constant mobilities, sigma is
    /// smallest at p = ni sqrt(mu_n/mu_p), i.e. N = ni (sqrt(b) - 1/sqrt(b)), b = mu_n/mu_p > 1
    /// (this estimate is refined numerically by [`Conversion::peak`] where it matters).
    /// Otherwise the floor is 1e-6 ni.
    fn floor_density_cm3(&self, ni: f64) -> Result<(f64, bool), ResistivityError> {
        let (mu_n, mu_p) = mobility::mobility_values(
            self.options.mobility,
            &self.material.id,
            &self.dopant.symbol,
            0.0,
            self.temperature_k,
        )?;
        let b = match self.dopant.kind {
            DopantKind::Donor => mu_p / mu_n,
            DopantKind::Acceptor => mu_n / mu_p,
        };
        let peak = if b > 1.0 {
            ni * (b.sqrt() - 1.0 / b.sqrt())
        } else {
            0.0
        };
        let floor = FLOOR_FRACTION_OF_NI * ni;
        Ok(if peak > floor {
            (peak, true)
        } else {
            (floor, false)
        })
    }

    /// The resistivity maximum near the estimate `floor_cm3`: (ln N, ln rho) by golden-section
    /// search over a factor 4 either side (the maximum is smooth and single).
    fn peak(&mut self, floor_cm3: f64) -> Result<(f64, f64), ResistivityError> {
        const INVERSE_GOLDEN: f64 = 0.618_033_988_749_894_8;
        let (mut a, mut b) = (floor_cm3.ln() - 4f64.ln(), floor_cm3.ln() + 4f64.ln());
        let mut x1 = b - INVERSE_GOLDEN * (b - a);
        let mut x2 = a + INVERSE_GOLDEN * (b - a);
        let mut f1 = self.state(x1.exp())?.resistivity_ohm_cm.ln();
        let mut f2 = self.state(x2.exp())?.resistivity_ohm_cm.ln();
        while b - a > 1e-9 {
            if f1 > f2 {
                b = x2;
                (x2, f2) = (x1, f1);
                x1 = b - INVERSE_GOLDEN * (b - a);
                f1 = self.state(x1.exp())?.resistivity_ohm_cm.ln();
            } else {
                a = x1;
                (x1, f1) = (x2, f2);
                x2 = a + INVERSE_GOLDEN * (b - a);
                f2 = self.state(x2.exp())?.resistivity_ohm_cm.ln();
            }
        }
        Ok(if f1 > f2 { (x1, f1) } else { (x2, f2) })
    }

    fn point(&mut self, density_cm3: f64) -> Result<ResistivityPoint, ResistivityError> {
        let s = match self.last.take() {
            Some((d, s)) if d == density_cm3 => s,
            _ => self.state(density_cm3)?,
        };
        let ionized = s.equilibrium.ionized_donors_cm3 + s.equilibrium.ionized_acceptors_cm3;
        let m = mobility::mobility(
            self.options.mobility,
            &self.material.id,
            &self.dopant.symbol,
            ionized,
            self.temperature_k,
        )?;
        let mut notes = m.notes;
        let species = &s.equilibrium.species[0];
        if species.ionized_fraction < INCOMPLETE_IONIZATION_NOTE_FRACTION {
            let why = match species.level_model {
                IonizationModel::Altermatt => {
                    "incomplete ionization of Altermatt et al. 2006, level and localized fraction \
                     lowered with density"
                }
                IonizationModel::PearsonBardeen => "Pearson-Bardeen level lowered with density",
                IonizationModel::Dilute => {
                    "dilute ionization model: constant level, no lowering with density"
                }
            };
            let regime = if s.equilibrium.regime == Regime::FreezeOut {
                "freeze-out: "
            } else {
                ""
            };
            notes.push(format!(
                "{regime}{:.1} % of the dopant is ionized ({why})",
                100.0 * species.ionized_fraction
            ));
        }
        Ok(ResistivityPoint {
            material_id: self.material.id.clone(),
            dopant: self.dopant.symbol.to_string(),
            conductivity_type: self.conductivity_type(),
            density_cm3,
            temperature_k: self.temperature_k,
            resistivity_ohm_cm: s.resistivity_ohm_cm,
            electrons_cm3: s.equilibrium.electrons_cm3,
            holes_cm3: s.equilibrium.holes_cm3,
            ionized_impurity_cm3: ionized,
            ionized_fraction: s.equilibrium.species[0].ionized_fraction,
            intrinsic_cm3: s.equilibrium.intrinsic_cm3,
            electron_mobility_cm2_per_v_s: s.mobilities.0,
            hole_mobility_cm2_per_v_s: s.mobilities.1,
            mobility_model: self.options.mobility,
            mobility_parameters: [m.electron_parameters, m.hole_parameters],
            regime: s.equilibrium.regime,
            degenerate: s.equilibrium.degenerate,
            notes,
        })
    }
}

/// Resistivity of `material` doped with `density_cm3` of `dopant_symbol` at `temperature_k`.
///
/// # Formula
/// rho = 1 / (q (n mu_n + p mu_p)); n, p from charge neutrality with Fermi-Dirac statistics and
/// incomplete ionization ([`crate::neutrality::solve`]); mu_n, mu_p from the selected mobility
/// model at N_I = N_D+ + N_A- (ionized impurities). q in C, n, p in cm^-3, mu in cm^2/V s.
///
/// # Validity
/// The mobility model's density and temperature range ([`MobilityModel::temperature_range_k`],
/// [`MobilityModel::max_density_cm3`]) and the carrier model's ([`crate::neutrality::solve`]).
/// The ionization model matters above about 1e17 cm^-3: with the default (`altermatt` for
/// silicon P, As, B) the physics resistivity at 296.15 K stays within about 17 % of the handbook
/// table up to 1e20 cm^-3 (Masetti within about 11 %), whereas the `dilute` model leaves heavy
/// doping mostly neutral and gives 1.8 to 7.6 times the handbook value at 1e19-1e20 cm^-3. The
/// mobility sets (Masetti, Arora) were fitted to resistivity data as if every dopant were
/// ionized, so any ionization model below 100 % counts part of the dopants twice as "missing";
/// the notes say when less than 90 % is ionized.
///
/// # References
/// Carrier statistics: see [`crate::neutrality`]; mobility: [`MobilityModel::reference`].
///
/// # Errors
/// [`ResistivityError::InvalidDensity`], [`ResistivityError::Dopant`],
/// [`ResistivityError::Mobility`], [`ResistivityError::Carriers`].
pub fn resistivity_from_density(
    material: &Material,
    dopant_symbol: &str,
    density_cm3: f64,
    temperature_k: f64,
    options: &PhysicsOptions,
) -> Result<ResistivityPoint, ResistivityError> {
    if !(density_cm3.is_finite() && density_cm3 >= 0.0) {
        return Err(ResistivityError::InvalidDensity {
            value_cm3: density_cm3,
        });
    }
    let mut c = Conversion::new(material, dopant_symbol, temperature_k, options)?;
    c.point(density_cm3)
}

/// Resistivity, carriers and mobilities of a sample with any mix of dopants.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct MixResistivity {
    /// Material id.
    pub material_id: String,
    /// Temperature, K.
    pub temperature_k: f64,
    /// n when n >= p, else p (the majority carrier).
    #[serde(rename = "type")]
    pub conductivity_type: ConductivityType,
    /// Free electrons, cm^-3.
    pub electrons_cm3: f64,
    /// Free holes, cm^-3.
    pub holes_cm3: f64,
    /// Ionized dopants N_D+ + N_A-, cm^-3 (the density the mobility is evaluated at).
    pub ionized_impurity_cm3: f64,
    /// Electron mobility, cm^2/V s.
    pub electron_mobility_cm2_per_v_s: f64,
    /// Hole mobility, cm^2/V s.
    pub hole_mobility_cm2_per_v_s: f64,
    /// Resistivity, ohm cm.
    pub resistivity_ohm_cm: f64,
    /// Mobility model used.
    pub mobility_model: MobilityModel,
    /// The species whose parameter sets were used (see [`mobility_species`]).
    pub mobility_species: String,
    /// Parameter sets used (electrons, holes).
    pub mobility_parameters: [&'static str; 2],
    /// Conduction regime from the neutrality solve.
    pub regime: Regime,
    /// Fermi level within 3 kT of a band edge or beyond.
    pub degenerate: bool,
    /// Every model and parameter source the result depends on: those of the neutrality solve,
    /// then the mobility model with its parameter sets.
    pub models: Vec<ModelUsed>,
    /// Extensions, substitutions and range remarks of the mobility model.
    pub notes: Vec<String>,
}

/// The species whose mobility parameter sets apply to a mix of dopants.
///
/// # Rule
/// Impurity scattering is summed over all ionized species (the mobility is evaluated at
/// N_D+ + N_A-), but the dopant-specific sets (Masetti's As, P and B sets) need one species:
/// 1. the most abundant listed species of the majority carrier's kind (donors when
///    `conductivity_type` is n, acceptors when p), zero densities included, the first listed on
///    a tie;
/// 2. else the most abundant listed species of any kind (the first listed on a tie);
/// 3. else (nothing listed) the material's first donor.
///
/// A single listed species is therefore always its own choice, whatever its density, which
/// keeps [`resistivity_of_mix`] equal to [`resistivity_from_density`] for one dopant. Choosing
/// the majority kind follows the model's fits: each set describes its carrier as the majority
/// carrier of the doped sample (Masetti et al. 1983, Table I). `None` only for a material
/// without donors and without listed species.
pub fn mobility_species(
    material: &Material,
    doping: &[DopantDensity],
    conductivity_type: ConductivityType,
) -> Option<Dopant> {
    let majority = match conductivity_type {
        ConductivityType::N => DopantKind::Donor,
        ConductivityType::P => DopantKind::Acceptor,
    };
    let most_abundant = |kind: Option<DopantKind>| {
        doping
            .iter()
            .filter(|d| kind.is_none_or(|k| d.dopant.kind == k))
            .fold(None::<&DopantDensity>, |best, d| match best {
                Some(b) if b.density_cm3 >= d.density_cm3 => Some(b),
                _ => Some(d),
            })
            .map(|d| d.dopant.clone())
    };
    most_abundant(Some(majority))
        .or_else(|| most_abundant(None))
        .or_else(|| {
            material
                .dopants
                .iter()
                .find(|d| d.kind == DopantKind::Donor)
                .cloned()
        })
}

/// Resistivity of `material` with any mix of dopants `doping` at `temperature_k`.
///
/// # Formula
/// rho = 1 / (q (n mu_n + p mu_p)); n, p from one charge-neutrality solve over every species
/// ([`crate::neutrality::solve`], Fermi-Dirac statistics, incomplete ionization); mu_n, mu_p
/// from `options.mobility` at the total ionized-impurity density N_I = N_D+ + N_A-, with the
/// parameter sets of the species that [`mobility_species`] picks (the majority kind's most
/// abundant species). q in C, n, p in cm^-3, mu in cm^2/V s. Compensating dopants lower the
/// carriers (n - p = N_D+ - N_A-) and also the mobility (both kinds scatter).
///
/// # Validity
/// As [`resistivity_from_density`], with the mobility model's density limit applied to N_I.
/// Mobility models fitted to singly doped silicon are used for compensated material on the
/// usual assumption that ionized donors and acceptors scatter alike (Matthiessen-type sum over
/// N_I); the parameter set of the minority kind's species is not used.
///
/// # References
/// Carrier statistics: see [`crate::neutrality`]; mobility: [`MobilityModel::reference`].
///
/// # Errors
/// [`ResistivityError::Carriers`] (temperature, densities, species of another material),
/// [`ResistivityError::Mobility`] (model not applicable to the chosen species, N_I or T out of
/// range), [`ResistivityError::NoMobilitySpecies`] when no species can carry a parameter set.
pub fn resistivity_of_mix(
    material: &Material,
    temperature_k: f64,
    doping: &[DopantDensity],
    options: &PhysicsOptions,
) -> Result<MixResistivity, ResistivityError> {
    let eq = neutrality::solve(material, temperature_k, doping, &options.solve)?;
    resistivity_of_equilibrium(material, doping, eq, options)
}

/// [`resistivity_of_mix`] for a sample whose neutrality solve the caller already has, so that a
/// view showing both the carriers and the resistivity solves once.
///
/// `equilibrium` must come from [`neutrality::solve`] with `material`, `doping` and
/// `options.solve`; its temperature is used.
///
/// # Errors
/// As [`resistivity_of_mix`], less the carrier errors.
pub fn resistivity_of_equilibrium(
    material: &Material,
    doping: &[DopantDensity],
    eq: Equilibrium,
    options: &PhysicsOptions,
) -> Result<MixResistivity, ResistivityError> {
    let temperature_k = eq.temperature_k;
    let conductivity_type = if eq.electrons_cm3 >= eq.holes_cm3 {
        ConductivityType::N
    } else {
        ConductivityType::P
    };
    let species = mobility_species(material, doping, conductivity_type).ok_or_else(|| {
        ResistivityError::NoMobilitySpecies {
            material_id: material.id.clone(),
        }
    })?;
    let ionized = eq.ionized_donors_cm3 + eq.ionized_acceptors_cm3;
    let mu = mobility::mobility(
        options.mobility,
        &material.id,
        &species.symbol,
        ionized,
        temperature_k,
    )?;
    let sigma = ELEMENTARY_CHARGE_C
        * (eq.electrons_cm3 * mu.electrons_cm2_per_v_s + eq.holes_cm3 * mu.holes_cm2_per_v_s);
    let mut models = eq.models.to_vec();
    models.push(ModelUsed {
        quantity: "mobility".into(),
        model: format!(
            "{} ({}; {}) at N_D+ + N_A-",
            options.mobility.name(),
            mu.electron_parameters,
            mu.hole_parameters
        )
        .into(),
        source: options.mobility.reference().into(),
    });
    Ok(MixResistivity {
        material_id: material.id.clone(),
        temperature_k,
        conductivity_type,
        electrons_cm3: eq.electrons_cm3,
        holes_cm3: eq.holes_cm3,
        ionized_impurity_cm3: ionized,
        electron_mobility_cm2_per_v_s: mu.electrons_cm2_per_v_s,
        hole_mobility_cm2_per_v_s: mu.holes_cm2_per_v_s,
        resistivity_ohm_cm: 1.0 / sigma,
        mobility_model: options.mobility,
        mobility_species: species.symbol.to_string(),
        mobility_parameters: [mu.electron_parameters, mu.hole_parameters],
        regime: eq.regime,
        degenerate: eq.degenerate,
        models,
        notes: mu.notes,
    })
}

/// Dopant density of `dopant_symbol` that gives `resistivity_ohm_cm` at `temperature_k`.
///
/// # Formula
/// Solves ln rho(N) = ln rho_target for ln N, rho(N) as in [`resistivity_from_density`].
///
/// # Method
/// A start from complete ionization (N = 1/(q rho mu_majority(N)), a few damped fixed-point
/// steps), a bracket grown from it by doubling steps within [`ReachableRange`], then Brent's
/// method (inverse quadratic interpolation safeguarded by bisection; Brent, Algorithms for
/// Minimization without Derivatives, 1973, ch. 4), which converges for any bracketed continuous
/// function. The answer is re-evaluated and returned only if it reproduces the target within
/// [`ROUND_TRIP_TOLERANCE`].
///
/// # Validity
/// As [`resistivity_from_density`]. The search covers the extrinsic branch only: for acceptors in
/// silicon a second, lower density that gives the same resistivity exists when the target is
/// above the intrinsic resistivity; a note says so.
///
/// # Errors
/// [`ResistivityError::InvalidResistivity`]; [`ResistivityError::AboveReachable`] (above what the
/// dopant can give, e.g. above the intrinsic resistivity for donors) and
/// [`ResistivityError::BelowReachable`] (below the value at the model's highest density), both
/// naming the limit; [`ResistivityError::InIonizationStep`] when the value falls in the step
/// that a Pearson-Bardeen level merging with its band puts in rho(N); the errors of
/// [`resistivity_from_density`]; [`ResistivityError::NotConverged`] if the tolerance is not met
/// (not expected).
pub fn density_from_resistivity(
    material: &Material,
    dopant_symbol: &str,
    resistivity_ohm_cm: f64,
    temperature_k: f64,
    options: &PhysicsOptions,
) -> Result<ResistivityPoint, ResistivityError> {
    if !(resistivity_ohm_cm.is_finite() && resistivity_ohm_cm > 0.0) {
        return Err(ResistivityError::InvalidResistivity {
            value_ohm_cm: resistivity_ohm_cm,
        });
    }
    let mut c = Conversion::new(material, dopant_symbol, temperature_k, options)?;
    let target = resistivity_ohm_cm.ln();
    let x_max = c.max_density_cm3().ln();

    // Start: complete ionization, majority carriers only; the first solve also gives ni.
    let mut x = complete_ionization_guess(&c, resistivity_ohm_cm)?;
    let first = c.state(x.exp())?;
    let ni = first.equilibrium.intrinsic_cm3;
    let (floor, has_peak) = c.floor_density_cm3(ni)?;
    let x_min = floor.ln();
    let mut g = if x < x_min {
        x = x_min;
        c.ln_rho(x.exp())? - target
    } else {
        let ln_rho = first.resistivity_ohm_cm.ln();
        c.last = Some((x.exp(), first));
        ln_rho - target
    };

    // g decreases with x on the extrinsic branch: g > 0 means more dopant is needed.
    let (lo, g_lo, hi, g_hi);
    let mut step = (2.0 * g.abs()).max(0.05);
    loop {
        if g.abs() <= LN_RHO_TOLERANCE {
            return finish(&mut c, x, resistivity_ohm_cm);
        }
        let limit = if g > 0.0 { x_max } else { x_min };
        if x == limit {
            if g < 0.0 && has_peak {
                // The true maximum may lie a little beyond the estimate: look there first.
                let (x_peak, ln_rho_peak) = c.peak(floor)?;
                if ln_rho_peak >= target {
                    (lo, g_lo, hi, g_hi) =
                        bracket_above_peak(&mut c, x_peak, ln_rho_peak - target, target, x_max)?;
                    break;
                }
            }
            return Err(out_of_reach(
                &mut c,
                resistivity_ohm_cm,
                g > 0.0,
                floor,
                has_peak,
            ));
        }
        let next = if g > 0.0 {
            (x + step).min(x_max)
        } else {
            (x - step).max(x_min)
        };
        let g_next = c.ln_rho(next.exp())? - target;
        if g_next.signum() != g.signum() || g_next == 0.0 {
            (lo, g_lo, hi, g_hi) = if next > x {
                (x, g, next, g_next)
            } else {
                (next, g_next, x, g)
            };
            break;
        }
        x = next;
        g = g_next;
        step *= 2.0;
    }

    let root = brent(lo, g_lo, hi, g_hi, |x| {
        c.ln_rho(x.exp()).map(|ln_rho| ln_rho - target)
    })?;
    let mut point = match finish(&mut c, root, resistivity_ohm_cm) {
        Err(e @ ResistivityError::NotConverged { .. }) => {
            return Err(step_or(&mut c, root, resistivity_ohm_cm, e));
        }
        other => other?,
    };
    if has_peak && point.density_cm3 < 1e3 * floor {
        let intrinsic = c.state(0.0)?.resistivity_ohm_cm;
        if resistivity_ohm_cm > intrinsic {
            point.notes.push(format!(
                "above the intrinsic resistivity ({intrinsic:.4e} ohm cm): a lower density, below \
                 {floor:.3e} cm^-3, gives the same resistivity; the higher one is reported"
            ));
        }
    }
    Ok(point)
}

/// ln N from complete ionization and majority carriers only: N = 1/(q rho mu(N)), solved by a
/// few damped fixed-point steps in ln N (a starting point, not an answer).
fn complete_ionization_guess(c: &Conversion<'_>, rho: f64) -> Result<f64, ResistivityError> {
    let x_max = c.max_density_cm3().ln();
    let mut x = (1.0 / (ELEMENTARY_CHARGE_C * rho * c.majority_mobility(0.0)?))
        .ln()
        .min(x_max);
    for _ in 0..4 {
        let mu = c.majority_mobility(x.exp())?;
        let x_new = (1.0 / (ELEMENTARY_CHARGE_C * rho * mu)).ln().min(x_max);
        x = 0.5 * (x + x_new);
    }
    Ok(x)
}

fn finish(
    c: &mut Conversion<'_>,
    x: f64,
    target_ohm_cm: f64,
) -> Result<ResistivityPoint, ResistivityError> {
    let point = c.point(x.exp())?;
    let mismatch = (point.resistivity_ohm_cm / target_ohm_cm - 1.0).abs();
    if mismatch > ROUND_TRIP_TOLERANCE || !mismatch.is_finite() {
        return Err(ResistivityError::NotConverged {
            value_ohm_cm: target_ohm_cm,
            mismatch,
        });
    }
    Ok(point)
}

/// The error for an inversion that ended at `x` (ln N) without meeting the tolerance:
/// [`ResistivityError::InIonizationStep`] when rho(N) steps across the target at `x` (the Brent
/// bracket closed on a discontinuity), else `otherwise`.
fn step_or(
    c: &mut Conversion<'_>,
    x: f64,
    target_ohm_cm: f64,
    otherwise: ResistivityError,
) -> ResistivityError {
    let (below, above) = match (
        c.state((x - STEP_PROBE_LN_DENSITY).exp()),
        c.state((x + STEP_PROBE_LN_DENSITY).exp()),
    ) {
        (Ok(b), Ok(a)) => (b, a),
        (Err(e), _) | (_, Err(e)) => return e,
    };
    let (rho_below, rho_above) = (below.resistivity_ohm_cm, above.resistivity_ohm_cm);
    let straddles = (rho_below - target_ohm_cm) * (rho_above - target_ohm_cm) < 0.0;
    // A continuous rho moves by about 2 STEP_PROBE_LN_DENSITY in ln rho across the probe.
    let jump = (rho_below / rho_above).ln().abs();
    if straddles && jump > 1e3 * STEP_PROBE_LN_DENSITY {
        return ResistivityError::InIonizationStep {
            value_ohm_cm: target_ohm_cm,
            density_cm3: x.exp(),
            below_step_ohm_cm: rho_below,
            above_step_ohm_cm: rho_above,
            model: below.equilibrium.species[0].level_model.id(),
        };
    }
    otherwise
}

/// Walks up from the resistivity maximum at `x_peak` (where g >= 0) until g < 0: the bracket
/// of the extrinsic-branch root.
fn bracket_above_peak(
    c: &mut Conversion<'_>,
    x_peak: f64,
    g_peak: f64,
    target: f64,
    x_max: f64,
) -> Result<(f64, f64, f64, f64), ResistivityError> {
    let mut step = 0.05;
    let (mut x, mut g) = (x_peak, g_peak);
    loop {
        let next = (x + step).min(x_max);
        let g_next = c.ln_rho(next.exp())? - target;
        if g_next <= 0.0 || next == x_max {
            return Ok((x, g, next, g_next));
        }
        (x, g) = (next, g_next);
        step *= 2.0;
    }
}

fn out_of_reach(
    c: &mut Conversion<'_>,
    value_ohm_cm: f64,
    too_high_density_needed: bool,
    floor: f64,
    has_peak: bool,
) -> ResistivityError {
    if too_high_density_needed {
        let max_density_cm3 = c.max_density_cm3();
        return match c.state(max_density_cm3) {
            Ok(s) => ResistivityError::BelowReachable {
                value_ohm_cm,
                min_ohm_cm: s.resistivity_ohm_cm,
                max_density_cm3,
                model: c.options.mobility.id(),
            },
            Err(e) => e,
        };
    }
    let max = if has_peak {
        c.peak(floor).map(|(_, ln_rho)| ln_rho.exp())
    } else {
        c.state(floor).map(|s| s.resistivity_ohm_cm)
    };
    let intrinsic = c.state(0.0).map(|s| s.resistivity_ohm_cm);
    match (max, intrinsic) {
        (Ok(max_ohm_cm), Ok(intrinsic_ohm_cm)) => ResistivityError::AboveReachable {
            value_ohm_cm,
            max_ohm_cm: max_ohm_cm.max(intrinsic_ohm_cm),
            intrinsic_ohm_cm,
            temperature_k: c.temperature_k,
        },
        (Err(e), _) | (_, Err(e)) => e,
    }
}

/// Lowest and highest resistivity `dopant_symbol` gives in `material` at `temperature_k`.
///
/// # Formula
/// min: rho at [`MobilityModel::max_density_cm3`]; max: the resistivity maximum for acceptors in
/// silicon (located by golden-section search), else rho at 1e-6 ni; never below the intrinsic
/// resistivity.
///
/// # Errors
/// As [`resistivity_from_density`].
pub fn reachable_range(
    material: &Material,
    dopant_symbol: &str,
    temperature_k: f64,
    options: &PhysicsOptions,
) -> Result<ReachableRange, ResistivityError> {
    let mut c = Conversion::new(material, dopant_symbol, temperature_k, options)?;
    let intrinsic = c.state(0.0)?;
    let (floor, has_peak) = c.floor_density_cm3(intrinsic.equilibrium.intrinsic_cm3)?;
    let (min_density_cm3, top) = if has_peak {
        let (x, ln_rho) = c.peak(floor)?;
        (x.exp(), ln_rho.exp())
    } else {
        (floor, c.state(floor)?.resistivity_ohm_cm)
    };
    let max_density_cm3 = c.max_density_cm3();
    let bottom = c.state(max_density_cm3)?.resistivity_ohm_cm;
    Ok(ReachableRange {
        min_resistivity_ohm_cm: bottom,
        max_density_cm3,
        max_resistivity_ohm_cm: top.max(intrinsic.resistivity_ohm_cm),
        min_density_cm3,
        intrinsic_resistivity_ohm_cm: intrinsic.resistivity_ohm_cm,
    })
}

/// Brent's method on a bracket [a, b] with f(a) f(b) <= 0: inverse quadratic or secant steps
/// kept inside the bracket, bisection whenever they do not shrink it fast enough.
///
/// Stops when |f| <= [`LN_RHO_TOLERANCE`] or the bracket is narrower than
/// [`LN_DENSITY_TOLERANCE`]. Reference: Brent, Algorithms for Minimization without Derivatives
/// (Prentice-Hall, 1973), ch. 4 (the zeroin procedure).
fn brent(
    a0: f64,
    fa0: f64,
    b0: f64,
    fb0: f64,
    mut f: impl FnMut(f64) -> Result<f64, ResistivityError>,
) -> Result<f64, ResistivityError> {
    let (mut a, mut fa, mut b, mut fb) = (a0, fa0, b0, fb0);
    let (mut c, mut fc) = (b, fb);
    let (mut d, mut e) = (b - a, b - a);
    for _ in 0..MAX_BRENT_ITERATIONS {
        if (fb > 0.0) == (fc > 0.0) {
            // The root lies between a and b: restart the interpolation with c = a.
            c = a;
            fc = fa;
            d = b - a;
            e = d;
        }
        if fc.abs() < fb.abs() {
            a = b;
            b = c;
            c = a;
            fa = fb;
            fb = fc;
            fc = fa;
        }
        let tol = 2.0 * f64::EPSILON * b.abs() + 0.5 * LN_DENSITY_TOLERANCE;
        let m = 0.5 * (c - b);
        if fb.abs() <= LN_RHO_TOLERANCE || m.abs() <= tol {
            return Ok(b);
        }
        if e.abs() < tol || fa.abs() <= fb.abs() {
            d = m;
            e = m;
        } else {
            let s = fb / fa;
            let (mut p, mut q);
            if a == c {
                p = 2.0 * m * s;
                q = 1.0 - s;
            } else {
                let qa = fa / fc;
                let r = fb / fc;
                p = s * (2.0 * m * qa * (qa - r) - (b - a) * (r - 1.0));
                q = (qa - 1.0) * (r - 1.0) * (s - 1.0);
            }
            if p > 0.0 {
                q = -q;
            } else {
                p = -p;
            }
            if 2.0 * p < (3.0 * m * q - (tol * q).abs()).min((e * q).abs()) {
                e = d;
                d = p / q;
            } else {
                d = m;
                e = m;
            }
        }
        a = b;
        fa = fb;
        b += if d.abs() > tol { d } else { tol.copysign(m) };
        fb = f(b)?;
    }
    Ok(b)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn brent_finds_a_cubic_root() {
        // x^3 - 2 = 0 has the root 2^(1/3): a check of the iteration alone.
        let root = brent(0.0, -2.0, 2.0, 6.0, |x| Ok(x * x * x - 2.0)).unwrap();
        approx::assert_abs_diff_eq!(root, 2f64.cbrt(), epsilon = 1e-10);
    }
}
