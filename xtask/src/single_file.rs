//! The self-contained build: one HTML file with the stylesheet, the icon, the
//! JavaScript glue and the gzip-compressed WebAssembly embedded, which works opened
//! straight from disk (file://) with no network.
//!
//! The wasm is embedded base64-encoded and unpacked in the page with the browser's
//! `DecompressionStream`; the glue's ES-module exports are turned into plain
//! declarations so that it can run inside one inline module script. The page carries a
//! Content-Security-Policy that allows exactly its own inline blocks (by hash) and no fetch.

use crate::dist::policy;
use base64::Engine as _;
use std::io::Write as _;
use std::path::{Path, PathBuf};

/// Name of the self-contained file inside the dist folder.
pub const FILE_NAME: &str = "bandgauge-standalone.html";

/// Tells the app it runs from the single file, so it registers no offline worker even when
/// the file happens to be served over http (the worker belongs to the folder build).
const DELIVERY_MARKER: &str = "<meta name=\"bandgauge-delivery\" content=\"single-file\">\n";

/// Builds `dist/bandgauge-standalone.html` from trunk's output in `dist`.
pub fn build(dist: &Path) -> Result<PathBuf, String> {
    let index = read_text(&dist.join("index.html"))?;
    let glue_href = attr_of_tag(&index, "<link rel=\"modulepreload\"", "href")
        .ok_or("dist/index.html has no modulepreload link to the JS glue")?;
    let glue = read_text(&dist.join(glue_href.trim_start_matches('/')))?;
    let wasm = crate::dist::wasm_files(dist)?
        .into_iter()
        .next()
        .ok_or("no .wasm in dist")?;
    let wasm_bytes =
        std::fs::read(&wasm).map_err(|e| format!("cannot read {}: {e}", wasm.display()))?;

    let mut html = remove_block(&index, "<script type=\"module\">", "</script>")?;
    for start in [
        "<link rel=\"modulepreload\"",
        "<link rel=\"preload\"",
        "<link rel=\"manifest\"",
    ] {
        while let Some(next) = remove_tag(&html, start) {
            html = next;
        }
    }
    if let Some(href) = attr_of_tag(&html, "<link rel=\"stylesheet\"", "href") {
        let css = read_text(&dist.join(href.trim_start_matches('/')))?;
        html = replace_tag(
            &html,
            "<link rel=\"stylesheet\"",
            &format!("<style>\n{css}\n</style>"),
        );
    }
    if let Some(href) = attr_of_tag(&html, "<link rel=\"icon\"", "href") {
        let svg = std::fs::read(dist.join(href.trim_start_matches('/'))).unwrap_or_default();
        let b64 = base64::engine::general_purpose::STANDARD.encode(svg);
        html = replace_tag(
            &html,
            "<link rel=\"icon\"",
            &format!("<link rel=\"icon\" href=\"data:image/svg+xml;base64,{b64}\"/>"),
        );
    }
    let script = loader_script(&glue, &wasm_bytes)?;
    let Some(head_end) = html.find("</head>") else {
        return Err("dist/index.html has no </head>".into());
    };
    html.insert_str(head_end, &script);
    html.insert_str(head_end, DELIVERY_MARKER);
    // Its own policy: only the inline blocks above, nothing fetched from anywhere.
    let csp = policy::for_page(&html, policy::Delivery::SingleFile)?;
    let html = policy::insert(&html, &csp)?;
    let out = dist.join(FILE_NAME);
    std::fs::write(&out, html).map_err(|e| format!("cannot write {}: {e}", out.display()))?;
    Ok(out)
}

fn read_text(path: &Path) -> Result<String, String> {
    std::fs::read_to_string(path).map_err(|e| format!("cannot read {}: {e}", path.display()))
}

/// The inline module: the glue without its exports, the compressed wasm, and the start-up.
fn loader_script(glue: &str, wasm: &[u8]) -> Result<String, String> {
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    gz.write_all(wasm).map_err(|e| format!("gzip: {e}"))?;
    let packed = gz.finish().map_err(|e| format!("gzip: {e}"))?;
    let b64 = base64::engine::general_purpose::STANDARD.encode(packed);
    let glue = strip_exports(glue);
    Ok(format!(
        "<script type=\"module\">\n{glue}\n\
const packed = Uint8Array.from(atob(\"{b64}\"), (c) => c.charCodeAt(0));\n\
const unpacked = new Blob([packed]).stream().pipeThrough(new DecompressionStream(\"gzip\"));\n\
const wasmBytes = await new Response(unpacked).arrayBuffer();\n\
const instance = await __wbg_init({{ module_or_path: wasmBytes }});\n\
dispatchEvent(new CustomEvent(\"TrunkApplicationStarted\", {{detail: {{wasm: instance}}}}));\n\
</script>\n"
    ))
}

/// Turns `export class/function/const` into plain declarations and drops export lists.
fn strip_exports(glue: &str) -> String {
    glue.lines()
        .filter(|l| !(l.starts_with("export {") || l.starts_with("export default")))
        .map(|l| l.strip_prefix("export ").unwrap_or(l))
        .collect::<Vec<_>>()
        .join("\n")
}

/// The value of `attr` in the first tag starting with `start`.
fn attr_of_tag<'a>(html: &'a str, start: &str, attr: &str) -> Option<&'a str> {
    let from = html.find(start)?;
    let tag = &html[from..from + html[from..].find('>')?];
    let key = format!("{attr}=\"");
    let at = tag.find(&key)? + key.len();
    let end = tag[at..].find('"')?;
    Some(&tag[at..at + end])
}

/// Removes the first tag starting with `start` (up to its `>`), or None if absent.
fn remove_tag(html: &str, start: &str) -> Option<String> {
    let from = html.find(start)?;
    let end = from + html[from..].find('>')? + 1;
    Some(format!("{}{}", &html[..from], &html[end..]))
}

fn replace_tag(html: &str, start: &str, with: &str) -> String {
    match (
        html.find(start),
        html.find(start)
            .and_then(|f| html[f..].find('>').map(|e| f + e + 1)),
    ) {
        (Some(from), Some(end)) => format!("{}{with}{}", &html[..from], &html[end..]),
        _ => html.to_string(),
    }
}

fn remove_block(html: &str, open: &str, close: &str) -> Result<String, String> {
    let from = html
        .find(open)
        .ok_or_else(|| format!("dist/index.html has no {open}"))?;
    let end = from
        + html[from..]
            .find(close)
            .ok_or_else(|| format!("{open} is not closed"))?
        + close.len();
    Ok(format!("{}{}", &html[..from], &html[end..]))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn exports_become_declarations() {
        // Source: the ES module syntax of wasm-bindgen's web target, common practice, no source.
        let glue = "export class A {}\nexport function f() {}\nfunction g() {}\nexport { initSync, __wbg_init as default };";
        assert_eq!(
            strip_exports(glue),
            "class A {}\nfunction f() {}\nfunction g() {}"
        );
    }

    #[test]
    fn tags_are_found_and_removed() {
        let html =
            "<head><link rel=\"preload\" href=\"/a.wasm\" as=\"fetch\"><title>x</title></head>";
        assert_eq!(
            attr_of_tag(html, "<link rel=\"preload\"", "href"),
            Some("/a.wasm")
        );
        assert_eq!(
            remove_tag(html, "<link rel=\"preload\"").as_deref(),
            Some("<head><title>x</title></head>")
        );
        assert_eq!(remove_tag(html, "<link rel=\"icon\""), None);
    }
}
