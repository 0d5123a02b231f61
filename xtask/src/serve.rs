//! `cargo xtask serve [--port N] [--release]`: install what is missing, build, and serve the
//! page on 127.0.0.1; an edit to the app, the core or `public/` rebuilds it (reload the page).
//!
//! The page is built by the same steps as `cargo xtask dist` (a development build unless
//! `--release`) into two folders under `target/serve/` in turn, so a failed rebuild leaves
//! the last good page served.

// The same file answering as the browser tests' servers.
#[path = "../../tests/src/static_files.rs"]
mod static_files;

use crate::dist::{self, Profile};
use crate::shell::root;
use crate::tools;
use std::path::{Path, PathBuf};
use std::sync::{Arc, RwLock};
use std::time::{Duration, SystemTime};

/// Default port of the development server.
const DEFAULT_PORT: u16 = 8080;
/// How often the sources are checked for edits.
const WATCH_INTERVAL: Duration = Duration::from_millis(700);
/// What a change to rebuilds for, relative to the workspace root.
const WATCHED: [&str; 5] = ["app", "core/src", "core/Cargo.toml", "public", "Cargo.lock"];

#[derive(Debug)]
struct Options {
    port: u16,
    profile: Profile,
}

pub fn run(args: &[String]) -> Result<(), String> {
    let options = parse(args)?;
    tools::ensure_build_tools()?;
    let folders = [root().join("target/serve/a"), root().join("target/serve/b")];
    dist::build(options.profile, &folders[0])?;
    let served = Arc::new(RwLock::new(folders[0].clone()));
    let server = tiny_http::Server::http(("127.0.0.1", options.port)).map_err(|e| {
        format!(
            "cannot listen on 127.0.0.1:{}: {e} (another server there? try --port N)",
            options.port
        )
    })?;
    let shared = Arc::clone(&served);
    std::thread::spawn(move || {
        for request in server.incoming_requests() {
            let folder = shared.read().map(|f| f.clone()).unwrap_or_default();
            respond(&folder, request);
        }
    });
    println!(
        "bandgauge: serving on http://127.0.0.1:{}/ (Ctrl-C stops; an edit rebuilds, then reload the page)",
        options.port
    );
    watch(options.profile, &folders, &served)
}

fn parse(args: &[String]) -> Result<Options, String> {
    let mut options = Options {
        port: DEFAULT_PORT,
        profile: Profile::Dev,
    };
    let mut rest = args.iter();
    while let Some(arg) = rest.next() {
        match arg.as_str() {
            "--release" => options.profile = Profile::Release,
            "--port" => {
                let value = rest.next().map(String::as_str).unwrap_or("");
                options.port = value
                    .parse::<u16>()
                    .ok()
                    .filter(|p| *p > 0)
                    .ok_or_else(|| {
                        format!(
                            "--port: '{value}' is not a port; give a whole number from 1 to 65535"
                        )
                    })?;
            }
            other => {
                return Err(format!(
                    "serve takes only [--port N] [--release], got: {other}"
                ));
            }
        }
    }
    Ok(options)
}

/// Rebuilds into the folder not being served whenever a watched file changes, then serves it.
fn watch(profile: Profile, folders: &[PathBuf; 2], served: &RwLock<PathBuf>) -> Result<(), String> {
    let mut seen = newest_change();
    let mut next = 1;
    loop {
        std::thread::sleep(WATCH_INTERVAL);
        let now = newest_change();
        if now <= seen {
            continue;
        }
        seen = now;
        eprintln!("xtask: sources changed, rebuilding");
        match dist::build(profile, &folders[next]) {
            Ok(()) => {
                if let Ok(mut folder) = served.write() {
                    *folder = folders[next].clone();
                }
                next = 1 - next;
                println!("bandgauge: rebuilt; reload the page");
            }
            Err(e) => eprintln!("xtask: rebuild failed, still serving the last good build: {e}"),
        }
    }
}

/// The latest modification time below the watched paths.
fn newest_change() -> SystemTime {
    fn walk(path: &Path, newest: &mut SystemTime) {
        let Ok(meta) = std::fs::metadata(path) else {
            return;
        };
        if let Ok(modified) = meta.modified() {
            *newest = (*newest).max(modified);
        }
        if meta.is_dir()
            && let Ok(entries) = std::fs::read_dir(path)
        {
            for entry in entries.flatten() {
                walk(&entry.path(), newest);
            }
        }
    }
    let mut newest = SystemTime::UNIX_EPOCH;
    for path in WATCHED {
        walk(&root().join(path), &mut newest);
    }
    newest
}

/// Answers one request from `folder`: the file, `index.html` for a folder, or 404.
fn respond(folder: &Path, request: tiny_http::Request) {
    let path = static_files::request_path(request.url()).to_string();
    let _ = request.respond(static_files::response(folder, &path));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn options_are_read_and_bad_ones_named() {
        let args = |a: &[&str]| a.iter().map(|s| s.to_string()).collect::<Vec<_>>();
        let o = parse(&args(&["--port", "9000", "--release"])).unwrap();
        assert_eq!((o.port, o.profile), (9000, Profile::Release));
        let o = parse(&[]).unwrap();
        assert_eq!((o.port, o.profile), (DEFAULT_PORT, Profile::Dev));
        assert!(
            parse(&args(&["--port", "0"]))
                .unwrap_err()
                .contains("--port: '0'")
        );
        assert!(
            parse(&args(&["--port"]))
                .unwrap_err()
                .contains("--port: ''")
        );
        assert!(parse(&args(&["--open"])).unwrap_err().contains("--open"));
    }

    #[test]
    fn wasm_is_served_as_wasm_and_nothing_outside_the_folder() {
        // Source: WebAssembly Web API, `application/wasm` for streaming compilation, from memory.
        let media = static_files::media_type;
        assert_eq!(media(Path::new("a_bg.wasm")), "application/wasm");
        assert_eq!(media(Path::new("index.html")), "text/html; charset=utf-8");
        let folder = Path::new("/srv/page");
        assert_eq!(static_files::file_for(folder, "/../etc/passwd"), None);
        assert_eq!(
            static_files::file_for(folder, "/"),
            Some(folder.join("index.html"))
        );
        assert_eq!(static_files::request_path("/a.js?v=1#x"), "/a.js");
    }
}
