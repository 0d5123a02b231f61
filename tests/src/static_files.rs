//! Answering one HTTP request from a folder of built page files: the file with its media
//! type, `index.html` for the folder itself, or 404 (also for a path that climbs out with
//! `..`). Shared by the browser tests' static servers and `cargo xtask serve`, which includes
//! this file by path (it has no other dependency than `tiny_http`).

use std::path::{Path, PathBuf};

/// The media type of a built file, by its extension.
pub fn media_type(path: &Path) -> &'static str {
    match path.extension().and_then(|e| e.to_str()).unwrap_or("") {
        "html" => "text/html; charset=utf-8",
        "js" => "text/javascript",
        "wasm" => "application/wasm",
        "css" => "text/css",
        "json" | "webmanifest" => "application/json",
        "svg" => "image/svg+xml",
        "png" => "image/png",
        "csv" => "text/csv",
        _ => "application/octet-stream",
    }
}

/// The path of a request without its query or fragment, as the server logs it.
pub fn request_path(url: &str) -> &str {
    url.split(['?', '#']).next().unwrap_or("/")
}

/// The file below `folder` that `path` names, or None when it climbs out of the folder.
pub fn file_for(folder: &Path, path: &str) -> Option<PathBuf> {
    let relative = path.trim_start_matches('/');
    if relative.split('/').any(|part| part == "..") {
        return None;
    }
    let file = folder.join(relative);
    Some(if relative.is_empty() || file.is_dir() {
        file.join("index.html")
    } else {
        file
    })
}

/// The response to a GET of `path` from `folder`.
pub fn response(folder: &Path, path: &str) -> tiny_http::ResponseBox {
    match file_for(folder, path).map(|file| (std::fs::read(&file), file)) {
        Some((Ok(bytes), file)) => {
            let header = tiny_http::Header::from_bytes("Content-Type", media_type(&file))
                .expect("a valid header");
            tiny_http::Response::from_data(bytes)
                .with_header(header)
                .boxed()
        }
        _ => tiny_http::Response::from_string("not found")
            .with_status_code(404)
            .boxed(),
    }
}
