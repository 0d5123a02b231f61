//! What the lots view holds across views: its inputs as typed, the work kept while another view
//! is shown, and the [`snapshot`] a sign-off record takes and the [`install`] an opened record
//! makes.

use std::cell::RefCell;

use bandgauge_core::lots::RowCounts;
use leptos::prelude::*;

use super::reading::Handles;
use super::work::LotsWork;

/// The view's inputs as typed, kept with the work while another view is shown.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct LotsInputs {
    /// Dopant symbol for rows without one ("" for none).
    pub dopant: String,
    /// "resistivity" or "density".
    pub quantity: String,
    /// Lower limit as typed.
    pub spec_min: String,
    /// Upper limit as typed.
    pub spec_max: String,
    /// Lot shown ("" for all).
    pub lot_filter: String,
    /// Wafer on the map, as `lot|wafer` ("" for the first).
    pub map_wafer: String,
    /// What the map colours, as the menu value ("" for resistivity).
    pub map_quantity: String,
    /// The wafer diameter as typed, mm ("" for the file's or the inferred one).
    pub map_diameter: String,
}

thread_local! {
    /// What the view held when another view was opened; taken back when it is shown again.
    pub(super) static KEPT: RefCell<Option<(LotsWork, LotsInputs)>> = const { RefCell::new(None) };
    /// The shown view's handles, so the sign-off report can read what it shows and an opened
    /// record can put its lot files back ([`snapshot`], [`install`]).
    pub(super) static LIVE: std::cell::Cell<Option<Live>> = const { std::cell::Cell::new(None) };
}

/// The handles of the shown view that [`snapshot`] reads and [`install`] sets.
#[derive(Clone, Copy)]
pub(super) struct Live {
    pub(super) handles: Handles,
    pub(super) job_files: RwSignal<usize>,
    pub(super) dopant: RwSignal<String>,
    pub(super) quantity: RwSignal<String>,
    pub(super) spec_min: RwSignal<String>,
    pub(super) spec_max: RwSignal<String>,
    pub(super) lot_filter: RwSignal<String>,
    pub(super) map_wafer: RwSignal<String>,
}

/// What the lots view holds, for a sign-off record: the spec inputs as typed and the files as
/// read, with the dopant they were read with.
#[derive(Debug, Clone, PartialEq)]
pub struct LotsSnapshot {
    /// The dopant given to rows without one when the files were read ("" for none).
    pub read_dopant: String,
    /// The spec inputs as typed.
    pub inputs: LotsInputs,
    /// Every file's name and bytes, or `None` when they outgrew
    /// [`MAX_RECORDED_BYTES`](super::MAX_RECORDED_BYTES).
    pub files: Option<Vec<(String, Vec<u8>)>>,
    /// Rows counted, as shown.
    pub counts: RowCounts,
    /// A file is being read.
    pub busy: bool,
    /// Why files could not be read, as shown (`name: reason`).
    pub file_errors: Vec<String>,
}

fn snapshot_of(work: &LotsWork, inputs: LotsInputs, busy: bool) -> LotsSnapshot {
    LotsSnapshot {
        read_dopant: work.default_dopant().unwrap_or_default().to_owned(),
        inputs,
        files: work.file_texts().map(|files| {
            files
                .into_iter()
                .map(|(name, bytes)| (name.to_owned(), bytes.to_vec()))
                .collect()
        }),
        counts: work.counts(),
        busy,
        file_errors: work
            .files
            .iter()
            .filter_map(|f| work.file_problem(f))
            .collect(),
    }
}

/// What the lots view holds now (shown or kept while another view is shown).
pub fn snapshot() -> LotsSnapshot {
    if let Some(live) = LIVE.with(std::cell::Cell::get) {
        let inputs = LotsInputs {
            dopant: live.dopant.get_untracked(),
            quantity: live.quantity.get_untracked(),
            spec_min: live.spec_min.get_untracked(),
            spec_max: live.spec_max.get_untracked(),
            lot_filter: live.lot_filter.get_untracked(),
            map_wafer: live.map_wafer.get_untracked(),
            ..LotsInputs::default()
        };
        let busy = live.handles.busy.get_untracked();
        if let Some(s) = live
            .handles
            .work
            .try_with_value(|w| snapshot_of(w, inputs, busy))
        {
            return s;
        }
    }
    KEPT.with(|k| match &*k.borrow() {
        Some((work, inputs)) => snapshot_of(work, inputs.clone(), false),
        None => snapshot_of(&LotsWork::new(None), LotsInputs::default(), false),
    })
}

/// Whether lot files are being read now.
pub fn is_reading() -> bool {
    LIVE.with(std::cell::Cell::get)
        .is_some_and(|l| l.handles.busy.get_untracked())
}

/// Puts read files and spec inputs in the lots view (shown now or when next opened). Refused
/// while files are being read.
pub fn install(work: LotsWork, inputs: LotsInputs) -> Result<(), String> {
    let Some(live) = LIVE.with(std::cell::Cell::get) else {
        KEPT.with(|k| *k.borrow_mut() = Some((work, inputs)));
        return Ok(());
    };
    if live.handles.busy.get_untracked() {
        return Err("lot files are being read; wait until reading ends".to_owned());
    }
    let files = work.files.len();
    live.handles.work.set_value(work);
    live.dopant.set(inputs.dopant);
    live.quantity.set(inputs.quantity);
    live.spec_min.set(inputs.spec_min);
    live.spec_max.set(inputs.spec_max);
    live.lot_filter.set(inputs.lot_filter);
    live.map_wafer.set(inputs.map_wafer);
    live.job_files.set(files);
    live.handles.progress.update(|n| *n += 1);
    live.handles.finished.update(|n| *n += 1);
    Ok(())
}
