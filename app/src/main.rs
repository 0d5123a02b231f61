//! Entry point of the browser app: installs the panic hook and mounts the root view.

fn main() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(bandgauge_app::App);
}
