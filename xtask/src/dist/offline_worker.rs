//! Fills in the offline worker (`dist/sw.js`) for one build: the build id that names its
//! cache, and the list of the app's own files it keeps.
//!
//! The build id is a SHA-256 over every listed file's name and bytes and the worker template,
//! so any change to the built app gives a new id, hence a byte-different `sw.js`, which the
//! browser installs on the next visit (and the new worker drops the old build's cache).

use sha2::{Digest as _, Sha256};
use std::path::{Path, PathBuf};

/// The worker's file name in `public/` and in the dist folder.
pub const WORKER_FILE: &str = "sw.js";
/// The template lines the build replaces; each must occur exactly once.
const BUILD_ID_LINE: &str = "const BUILD_ID = \"unbuilt\";";
const APP_FILES_LINE: &str = "const APP_FILES = [];";
/// Hex digits of the digest kept as the build id (64 bits: no accidental repeats).
const BUILD_ID_HEX_DIGITS: usize = 16;

/// Writes the build id and the file list into `dist/sw.js`; `skip` names files the worker
/// must not keep (the self-contained file, which is for use from disk). Returns the id.
pub fn finish(dist: &Path, skip: &[&str]) -> Result<String, String> {
    let worker = dist.join(WORKER_FILE);
    let template = std::fs::read_to_string(&worker)
        .map_err(|e| format!("cannot read {}: {e}", worker.display()))?;
    let mut files = Vec::new();
    collect_files(dist, dist, &mut files)?;
    files.retain(|name| name != WORKER_FILE && !skip.contains(&name.as_str()));
    files.sort();
    let mut hasher = Sha256::new();
    hasher.update(template.as_bytes());
    for name in &files {
        let bytes = std::fs::read(dist.join(name))
            .map_err(|e| format!("cannot read {}/{name}: {e}", dist.display()))?;
        hasher.update(name.as_bytes());
        hasher.update([0]);
        hasher.update(&bytes);
        hasher.update((bytes.len() as u64).to_le_bytes());
    }
    let build_id: String = hasher
        .finalize()
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect::<String>()[..BUILD_ID_HEX_DIGITS]
        .to_string();
    let filled = fill(&template, &build_id, &files)?;
    std::fs::write(&worker, filled)
        .map_err(|e| format!("cannot write {}: {e}", worker.display()))?;
    Ok(build_id)
}

/// The template with the build id and the file list (the page itself first, as `./`).
fn fill(template: &str, build_id: &str, files: &[String]) -> Result<String, String> {
    for line in [BUILD_ID_LINE, APP_FILES_LINE] {
        let count = template.matches(line).count();
        if count != 1 {
            return Err(format!(
                "public/{WORKER_FILE} must contain `{line}` exactly once (found {count}): \
                 the build writes the file list there"
            ));
        }
    }
    if let Some(bad) = files.iter().find(|n| n.contains(['"', '\\', '\n'])) {
        return Err(format!(
            "dist file name {bad:?} cannot be listed in {WORKER_FILE}"
        ));
    }
    let mut list = String::from("const APP_FILES = [\n  \"./\",\n");
    for name in files {
        list.push_str(&format!("  \"{name}\",\n"));
    }
    list.push_str("];");
    Ok(template
        .replace(BUILD_ID_LINE, &format!("const BUILD_ID = \"{build_id}\";"))
        .replace(APP_FILES_LINE, &list))
}

/// Every file below `dir`, as a `/`-separated path relative to `dist`.
fn collect_files(dist: &Path, dir: &Path, out: &mut Vec<String>) -> Result<(), String> {
    let entries =
        std::fs::read_dir(dir).map_err(|e| format!("cannot read {}: {e}", dir.display()))?;
    for entry in entries {
        let path: PathBuf = entry
            .map_err(|e| format!("cannot read {}: {e}", dir.display()))?
            .path();
        if path.is_dir() {
            collect_files(dist, &path, out)?;
        } else if let Ok(rel) = path.strip_prefix(dist) {
            let parts: Vec<String> = rel
                .components()
                .map(|c| c.as_os_str().to_string_lossy().into_owned())
                .collect();
            out.push(parts.join("/"));
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    const TEMPLATE: &str = "const BUILD_ID = \"unbuilt\";\nconst APP_FILES = [];\nrest();\n";

    #[test]
    fn template_gets_the_id_and_the_page_then_the_files() {
        let out = fill(TEMPLATE, "0123abcd", &["a.js".into(), "b/c.wasm".into()]).unwrap();
        assert_eq!(
            out,
            "const BUILD_ID = \"0123abcd\";\nconst APP_FILES = [\n  \"./\",\n  \"a.js\",\n  \
             \"b/c.wasm\",\n];\nrest();\n"
        );
    }

    #[test]
    fn a_template_without_its_markers_is_refused() {
        let err = fill("const APP_FILES = [];", "x", &[]).unwrap_err();
        assert!(err.contains("BUILD_ID"), "{err}");
        // A worker filled in before (built twice over the same folder) has no markers either.
        let once = fill(TEMPLATE, "x", &[]).unwrap();
        assert!(fill(&once, "y", &[]).is_err());
    }

    #[test]
    fn build_id_follows_the_content() {
        let dir = std::env::temp_dir().join(format!("xtask-worker-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(dir.join("sub")).unwrap();
        let id_with = |app: &str| {
            std::fs::write(dir.join(WORKER_FILE), TEMPLATE).unwrap();
            std::fs::write(dir.join("app.js"), app).unwrap();
            std::fs::write(dir.join("sub/x.css"), "x").unwrap();
            std::fs::write(dir.join("skip.html"), app).unwrap();
            let id = finish(&dir, &["skip.html"]).unwrap();
            let worker = std::fs::read_to_string(dir.join(WORKER_FILE)).unwrap();
            assert!(worker.contains("\"sub/x.css\""), "{worker}");
            assert!(!worker.contains("skip.html"), "{worker}");
            id
        };
        let first = id_with("one");
        assert_eq!(first.len(), BUILD_ID_HEX_DIGITS);
        assert_eq!(id_with("one"), first, "same content, same id");
        assert_ne!(id_with("two"), first, "changed content, new id");
        let _ = std::fs::remove_dir_all(&dir);
    }
}
