//! The served page: `public/index.html` with the build's assets linked where its
//! `<!-- bandgauge:assets -->` marker stands, and the files it names written beside it.
//!
//! The stylesheet, the icon, the JS glue and the wasm get content-hashed names (a new build
//! never meets an old file in a cache); the manifest, the plain-named icon it refers to and
//! the offline worker keep their names. Every link is relative, so the folder works under
//! any path of a web server.

use sha2::{Digest as _, Sha256};
use std::path::Path;

/// The comment in `public/index.html` the asset links replace.
pub const ASSETS_MARKER: &str = "<!-- bandgauge:assets -->";
/// The stylesheet and the icon in `public/`.
pub const STYLE_FILE: &str = "style.css";
pub const ICON_FILE: &str = "icon.svg";
/// Files of `public/` copied under their own names: the manifest names the icon plainly and
/// the offline worker's address must not change between builds.
const PLAIN_COPIES: [&str; 3] = ["manifest.webmanifest", ICON_FILE, "sw.js"];
/// The base name of the glue and the wasm.
const APP_NAME: &str = "bandgauge-app";
/// Hex digits of the content hash in a file name (64 bits).
const HASH_HEX_DIGITS: usize = 16;

/// The page's sources, read once and shared by the served page and the single file.
pub struct Sources {
    /// `public/index.html`, with its assets marker.
    pub template: String,
    pub style: String,
    pub icon: Vec<u8>,
    pub glue: String,
    pub wasm: Vec<u8>,
}

impl Sources {
    /// Reads the template, the stylesheet and the icon from `public`.
    pub fn read(public: &Path, glue: String, wasm: Vec<u8>) -> Result<Sources, String> {
        let read = |name: &str| {
            let path = public.join(name);
            std::fs::read(&path).map_err(|e| format!("cannot read {}: {e}", path.display()))
        };
        let text = |name: &str| {
            String::from_utf8(read(name)?).map_err(|_| format!("public/{name} is not UTF-8"))
        };
        let template = text("index.html")?;
        if template.matches(ASSETS_MARKER).count() != 1 {
            return Err(format!(
                "public/index.html must contain `{ASSETS_MARKER}` exactly once: the build \
                 puts the asset links there"
            ));
        }
        Ok(Sources {
            template,
            style: text(STYLE_FILE)?,
            icon: read(ICON_FILE)?,
            glue,
            wasm,
        })
    }
}

/// `stem-<hash>.ext`, the hash taken over `bytes`.
pub fn hashed_name(stem: &str, ext: &str, bytes: &[u8]) -> String {
    let digest = Sha256::digest(bytes);
    let hex: String = digest.iter().map(|b| format!("{b:02x}")).collect();
    format!("{stem}-{}.{ext}", &hex[..HASH_HEX_DIGITS])
}

/// The asset links and the loader that replace the marker, for files named as given.
fn asset_block(style: &str, icon: &str, glue: &str, wasm: &str) -> String {
    format!(
        "<link rel=\"stylesheet\" href=\"./{style}\">\n  \
         <link rel=\"icon\" type=\"image/svg+xml\" href=\"./{icon}\">\n  \
         <link rel=\"modulepreload\" href=\"./{glue}\">\n  \
         <link rel=\"preload\" href=\"./{wasm}\" as=\"fetch\" type=\"application/wasm\" crossorigin>\n  \
         <script type=\"module\">\nimport init from \"./{glue}\";\nawait init({{ module_or_path: \"./{wasm}\" }});\n</script>"
    )
}

/// Writes `index.html` and every file it names into `dist` (which must exist).
pub fn write(dist: &Path, public: &Path, sources: &Sources) -> Result<(), String> {
    let write = |name: &str, bytes: &[u8]| {
        let path = dist.join(name);
        std::fs::write(&path, bytes).map_err(|e| format!("cannot write {}: {e}", path.display()))
    };
    let style = hashed_name("style", "css", sources.style.as_bytes());
    let icon = hashed_name("icon", "svg", &sources.icon);
    let wasm = hashed_name(&format!("{APP_NAME}_bg"), "wasm", &sources.wasm);
    // The glue names no wasm file (the loader passes it), so hash it with the wasm: a new
    // module always comes with a new glue name.
    let glue = hashed_name(
        APP_NAME,
        "js",
        &[sources.glue.as_bytes(), &sources.wasm].concat(),
    );
    write(&style, sources.style.as_bytes())?;
    write(&icon, &sources.icon)?;
    write(&glue, sources.glue.as_bytes())?;
    write(&wasm, &sources.wasm)?;
    for name in PLAIN_COPIES {
        let from = public.join(name);
        std::fs::copy(&from, dist.join(name))
            .map_err(|e| format!("cannot copy {}: {e}", from.display()))?;
    }
    let html = sources
        .template
        .replace(ASSETS_MARKER, &asset_block(&style, &icon, &glue, &wasm));
    write("index.html", html.as_bytes())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn names_follow_the_content() {
        // Source: SHA-256 of the empty input, FIPS 180-4 test vectors (e3b0c442 98fc1c14...).
        assert_eq!(hashed_name("a", "css", b""), "a-e3b0c44298fc1c14.css");
        assert_ne!(hashed_name("a", "css", b"x"), hashed_name("a", "css", b"y"));
    }

    #[test]
    fn the_loader_imports_the_glue_and_passes_the_wasm() {
        let block = asset_block("s.css", "i.svg", "g.js", "w.wasm");
        assert!(block.contains("<link rel=\"modulepreload\" href=\"./g.js\">"));
        assert!(block.contains("import init from \"./g.js\";"));
        assert!(block.contains("module_or_path: \"./w.wasm\""));
        assert!(block.contains("<link rel=\"stylesheet\" href=\"./s.css\">"));
        // One inline script: the policy hashes exactly this block.
        assert_eq!(block.matches("<script").count(), 1);
    }
}
