//! Entry point of the browser app: installs the panic panel, mounts the root view and
//! registers the offline worker.

use bandgauge_app::{browser, crash_panel};

fn main() {
    // Before anything else, so that any panic leaves a panel with a way out, not a dead page.
    crash_panel::install();
    leptos::mount::mount_to_body(bandgauge_app::App);
    browser::register_offline_worker();
    if crash_panel::drill_requested(&browser::query()) {
        panic!(
            "panic drill: the address asked for a deliberate failure (`{}`) to show this panel",
            crash_panel::DRILL_KEY
        );
    }
}
