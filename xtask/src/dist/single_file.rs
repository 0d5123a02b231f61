//! The self-contained build: one HTML file with the stylesheet, the icon, the
//! JavaScript glue and the gzip-compressed WebAssembly embedded, which works opened
//! straight from disk (file://) with no network.
//!
//! The wasm is embedded base64-encoded and unpacked in the page with the browser's
//! `DecompressionStream`; the glue's ES-module exports are turned into plain
//! declarations so that it can run inside one inline module script. The page carries a
//! Content-Security-Policy that allows exactly its own inline blocks (by hash) and no fetch.

use super::page::{ASSETS_MARKER, Sources};
use super::policy;
use base64::Engine as _;
use std::io::Write as _;
use std::path::{Path, PathBuf};

/// Name of the self-contained file inside the dist folder.
pub const FILE_NAME: &str = "bandgauge-standalone.html";

/// Tells the app it runs from the single file, so it registers no offline worker even when
/// the file happens to be served over http (the worker belongs to the folder build).
const DELIVERY_MARKER: &str = "<meta name=\"bandgauge-delivery\" content=\"single-file\">\n";

/// The manifest link of the template: a file opened from disk has no manifest to fetch.
const MANIFEST_LINK: &str = "<link rel=\"manifest\"";

/// Writes `FILE_NAME` into `dist` from the page's sources and returns its path.
pub fn build(dist: &Path, sources: &Sources) -> Result<PathBuf, String> {
    let mut html = sources.template.clone();
    while let Some(next) = remove_tag(&html, MANIFEST_LINK) {
        html = next;
    }
    let icon = base64::engine::general_purpose::STANDARD.encode(&sources.icon);
    let inline = format!(
        "<style>\n{}\n</style>\n  <link rel=\"icon\" href=\"data:image/svg+xml;base64,{icon}\"/>\n  {}{}",
        sources.style,
        DELIVERY_MARKER,
        loader_script(&sources.glue, &sources.wasm)?
    );
    let html = html.replace(ASSETS_MARKER, &inline);
    // Its own policy: only the inline blocks above, nothing fetched from anywhere.
    let csp = policy::for_page(&html, policy::Delivery::SingleFile)?;
    let html = policy::insert(&html, &csp)?;
    let out = dist.join(FILE_NAME);
    std::fs::write(&out, html).map_err(|e| format!("cannot write {}: {e}", out.display()))?;
    Ok(out)
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
await __wbg_init({{ module_or_path: wasmBytes }});\n\
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

/// Removes the first tag starting with `start` (up to its `>`), or None if absent.
fn remove_tag(html: &str, start: &str) -> Option<String> {
    let from = html.find(start)?;
    let end = from + html[from..].find('>')? + 1;
    Some(format!("{}{}", &html[..from], &html[end..]))
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
    fn tags_are_removed() {
        let html =
            "<head><link rel=\"preload\" href=\"/a.wasm\" as=\"fetch\"><title>x</title></head>";
        assert_eq!(
            remove_tag(html, "<link rel=\"preload\"").as_deref(),
            Some("<head><title>x</title></head>")
        );
        assert_eq!(remove_tag(html, "<link rel=\"icon\""), None);
    }
}
