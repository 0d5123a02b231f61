//! Reading lot files in the page: Blob slices through a `FileReader`, one chunk per event-loop
//! turn, so the page keeps handling events and shows progress.

use std::cell::RefCell;
use std::rc::Rc;

use leptos::prelude::*;
use wasm_bindgen::{JsCast, JsValue, closure::Closure};

use super::CHUNK_BYTES;
use super::work::LotsWork;

/// Something to read: a picked or dropped file, or a built-in text.
pub(super) enum Source {
    File(web_sys::File),
    Text(String, String),
}

impl Source {
    fn size(&self) -> f64 {
        match self {
            Source::File(file) => file.size(),
            Source::Text(_, text) => text.len() as f64,
        }
    }
}

pub(super) fn files_of(list: Option<web_sys::FileList>) -> Vec<Source> {
    let Some(list) = list else { return Vec::new() };
    (0..list.length())
        .filter_map(|i| list.get(i))
        .map(Source::File)
        .collect()
}

/// The view's handles a reading job updates.
#[derive(Clone, Copy)]
pub(super) struct Handles {
    pub(super) work: StoredValue<LotsWork, LocalStorage>,
    pub(super) progress: RwSignal<u64>,
    pub(super) finished: RwSignal<u64>,
    pub(super) busy: RwSignal<bool>,
}

/// The reading job shared by the chunk callbacks.
struct Job {
    sources: Vec<Source>,
    index: usize,
    offset: f64,
}

impl Job {
    /// Moves on to the next source.
    fn next_source(&mut self) {
        self.index += 1;
        self.offset = 0.0;
    }
}

/// Reads every source in turn, one chunk per event-loop turn, then marks the work finished.
pub(super) fn read_sources(sources: Vec<Source>, handles: Handles) {
    let job = Rc::new(RefCell::new(Job {
        sources,
        index: 0,
        offset: 0.0,
    }));
    step(job, handles);
}

/// What the next step of a reading job does.
enum Next {
    /// Every source is read.
    Done,
    /// A piece was read; go on once the page has handled its events.
    Yield {
        /// The piece ended its source.
        file_done: bool,
    },
    /// Read this slice of the current file.
    Read(web_sys::Blob),
    /// The view is gone.
    Stop,
}

/// Takes the next piece of the job: reads a chunk of a built-in text at once, or cuts the next
/// slice of a file for the `FileReader`.
fn next_piece(job: &mut Job, work: StoredValue<LotsWork, LocalStorage>) -> Next {
    let offset = job.offset;
    let Some(source) = job.sources.get(job.index) else {
        return Next::Done;
    };
    let size = source.size();
    if offset == 0.0 {
        let name = match source {
            Source::File(file) => file.name(),
            Source::Text(name, _) => name.clone(),
        };
        if work
            .try_update_value(|w| w.begin_file(&name, size as u64))
            .is_none()
        {
            return Next::Stop;
        }
    }
    let end = (offset + CHUNK_BYTES as f64).min(size);
    match source {
        Source::Text(_, text) => {
            let piece = &text.as_bytes()[offset as usize..end as usize];
            let file_done = end >= size;
            let alive = work.try_update_value(|w| {
                w.feed(piece);
                if file_done || w.current_failed() {
                    w.end_file();
                    true
                } else {
                    false
                }
            });
            match alive {
                None => Next::Stop,
                Some(done) => {
                    if done {
                        job.next_source();
                    } else {
                        job.offset = end;
                    }
                    Next::Yield { file_done: done }
                }
            }
        }
        Source::File(file) => match file.slice_with_f64_and_f64(offset, end) {
            Ok(blob) => {
                job.offset = end;
                Next::Read(blob)
            }
            Err(_) => {
                work.update_value(|w| w.fail_file("the browser could not cut the file in parts"));
                job.next_source();
                Next::Yield { file_done: true }
            }
        },
    }
}

/// Reads one piece and schedules the next, so the page handles its events between pieces.
fn step(job: Rc<RefCell<Job>>, handles: Handles) {
    let next = next_piece(&mut job.borrow_mut(), handles.work);
    match next {
        Next::Done => {
            handles.busy.set(false);
            handles.finished.update(|n| *n += 1);
        }
        Next::Stop => {}
        Next::Yield { file_done } => {
            after_piece(file_done, handles);
            set_timeout(move || step(job, handles), std::time::Duration::ZERO);
        }
        Next::Read(blob) => {
            let Ok(reader) = web_sys::FileReader::new() else {
                handles
                    .work
                    .update_value(|w| w.fail_file("the browser cannot read files here"));
                job.borrow_mut().next_source();
                after_piece(true, handles);
                step(job, handles);
                return;
            };
            let reader_in_callback = reader.clone();
            let job_here = job.clone();
            // `loadend` comes after a successful read and after a failed one alike.
            let on_loadend = Closure::once_into_js(move |_: JsValue| {
                let bytes = reader_in_callback
                    .result()
                    .ok()
                    .filter(|r| !r.is_null() && !r.is_undefined())
                    .map(|buffer| js_sys::Uint8Array::new(&buffer).to_vec());
                let file_done = {
                    let mut j = job.borrow_mut();
                    let size = j.sources.get(j.index).map_or(0.0, Source::size);
                    let at_end = j.offset >= size;
                    let done = handles.work.try_update_value(|w| {
                        match &bytes {
                            Some(b) => w.feed(b),
                            None => w.fail_file("the browser could not read the file"),
                        }
                        let done = at_end || w.current_failed();
                        if done {
                            w.end_file();
                        }
                        done
                    });
                    let Some(done) = done else { return };
                    if done {
                        j.next_source();
                    }
                    done
                };
                after_piece(file_done, handles);
                step(job, handles);
            });
            reader.set_onloadend(Some(on_loadend.unchecked_ref()));
            if reader.read_as_array_buffer(&blob).is_err() {
                reader.set_onloadend(None);
                handles
                    .work
                    .update_value(|w| w.fail_file("the browser could not read the file"));
                job_here.borrow_mut().next_source();
                after_piece(true, handles);
                step(job_here, handles);
            }
        }
    }
}

/// Tells the page a piece was read (and a file finished, if it was).
fn after_piece(file_done: bool, handles: Handles) {
    handles.progress.update(|n| *n += 1);
    if file_done {
        handles.finished.update(|n| *n += 1);
    }
}
