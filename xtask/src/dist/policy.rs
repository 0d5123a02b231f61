//! The Content-Security-Policy written into each built page: the app may load nothing but
//! its own files, and only the inline scripts and styles the build itself wrote may run.
//!
//! Inline blocks are allowed by their SHA-256 hashes (computed from the final HTML, so any
//! later change to a block without re-hashing stops it from running instead of loosening
//! the policy). WebAssembly needs `'wasm-unsafe-eval'`, which allows compiling wasm and
//! nothing else (no `eval` of JavaScript). The one relaxation is `style-src-attr
//! 'unsafe-inline'`, for the style attribute plotters sets to measure chart text.

use base64::Engine as _;
use sha2::{Digest as _, Sha256};

/// How a built page reaches the browser, which decides what "its own files" means.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Delivery {
    /// `dist/index.html` from a web server: scripts, styles, the wasm, the icon, the
    /// manifest and the offline worker come from the page's own origin.
    Served,
    /// The self-contained file opened from disk: everything is inline or a `data:` URL,
    /// so nothing at all may be fetched.
    SingleFile,
}

/// The `<meta>` tag that opens a policy; a built page carries exactly one.
const META_START: &str = "<meta http-equiv=\"Content-Security-Policy\"";

/// The policy for `html` (the final page, with every inline block in place).
pub fn for_page(html: &str, delivery: Delivery) -> Result<String, String> {
    let scripts = inline_hashes(html, "script")?;
    let styles = inline_hashes(html, "style")?;
    let own = match delivery {
        Delivery::Served => vec!["'self'".to_string()],
        Delivery::SingleFile => Vec::new(),
    };
    let list = |mut first: Vec<String>, more: &[String], last: &[&str]| {
        first.extend(more.iter().cloned());
        first.extend(last.iter().map(|s| s.to_string()));
        if first.is_empty() {
            "'none'".to_string()
        } else {
            first.join(" ")
        }
    };
    let mut directives = vec![
        "default-src 'none'".to_string(),
        format!(
            "script-src {}",
            list(own.clone(), &scripts, &["'wasm-unsafe-eval'"])
        ),
        format!("style-src {}", list(own.clone(), &styles, &[])),
        // plotters measures chart text with a <span style="..."> (its web font code sets the
        // attribute); without this the labels are measured at the wrong size. A style
        // attribute cannot run script, and any url() in it is still bound by img-src.
        "style-src-attr 'unsafe-inline'".to_string(),
        // data: for the embedded icon; blob: and data: for chart images made in the page.
        format!("img-src {}", list(own.clone(), &[], &["data:", "blob:"])),
        format!("connect-src {}", list(own.clone(), &[], &[])),
    ];
    if delivery == Delivery::Served {
        directives.push("manifest-src 'self'".into());
        directives.push("worker-src 'self'".into());
    }
    directives
        .extend(["object-src 'none'", "base-uri 'none'", "form-action 'none'"].map(String::from));
    Ok(directives.join("; "))
}

/// Writes `policy` into `html` right after `<meta charset>` (before anything it governs),
/// replacing a policy already there.
pub fn insert(html: &str, policy: &str) -> Result<String, String> {
    let mut html = html.to_string();
    while let Some(from) = html.find(META_START) {
        let end = from
            + html[from..]
                .find('>')
                .ok_or("an unclosed Content-Security-Policy <meta>")?
            + 1;
        html.replace_range(from..end, "");
    }
    let at = match html.find("<meta charset") {
        Some(from) => from + html[from..].find('>').ok_or("an unclosed <meta charset>")? + 1,
        None => html.find("<head>").ok_or("the page has no <head>")? + "<head>".len(),
    };
    html.insert_str(at, &format!("\n  {META_START} content=\"{policy}\">"));
    Ok(html)
}

/// `'sha256-...'` sources for every inline `<tag>` block (one without `src=`), in order.
fn inline_hashes(html: &str, tag: &str) -> Result<Vec<String>, String> {
    let open = format!("<{tag}");
    let close = format!("</{tag}>");
    let mut hashes = Vec::new();
    let mut rest = html;
    while let Some(at) = rest.find(&open) {
        let after = &rest[at + open.len()..];
        if !after.starts_with(['>', ' ', '\n', '\t']) {
            rest = after; // a longer tag name such as <scripts>
            continue;
        }
        let tag_end = after
            .find('>')
            .ok_or_else(|| format!("an unclosed <{tag}> tag"))?;
        let body_and_rest = &after[tag_end + 1..];
        let body_end = body_and_rest
            .find(&close)
            .ok_or_else(|| format!("<{tag}> without {close}"))?;
        if !after[..tag_end].contains("src=") {
            hashes.push(hash_source(&body_and_rest[..body_end]));
        }
        rest = &body_and_rest[body_end + close.len()..];
    }
    Ok(hashes)
}

/// The CSP hash source of a block's text, exactly as the browser hashes it.
fn hash_source(text: &str) -> String {
    let digest = Sha256::digest(text.as_bytes());
    format!(
        "'sha256-{}'",
        base64::engine::general_purpose::STANDARD.encode(digest)
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hash_matches_the_csp_specification_example() {
        // Source: W3C Content Security Policy Level 3, the example of a hash source: the
        // script `alert('Hello, world.');` is allowed by
        // 'sha256-qznLcsROx4GACP2dm0UCKCzCG+HiZ1guq6ZZDob/Tng=' (example recalled from memory;
        // the same digest comes out of Python's hashlib.sha256 + base64.b64encode).
        assert_eq!(
            hash_source("alert('Hello, world.');"),
            "'sha256-qznLcsROx4GACP2dm0UCKCzCG+HiZ1guq6ZZDob/Tng='"
        );
    }

    #[test]
    fn served_page_allows_its_origin_and_its_inline_loader_only() {
        let html = "<head><meta charset=\"utf-8\"><script type=\"module\">alert('Hello, world.');</script>\
                    <script src=\"/a.js\"></script><noscript>x</noscript></head>";
        let policy = for_page(html, Delivery::Served).unwrap();
        assert_eq!(
            policy,
            "default-src 'none'; \
             script-src 'self' 'sha256-qznLcsROx4GACP2dm0UCKCzCG+HiZ1guq6ZZDob/Tng=' 'wasm-unsafe-eval'; \
             style-src 'self'; style-src-attr 'unsafe-inline'; img-src 'self' data: blob:; connect-src 'self'; \
             manifest-src 'self'; worker-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'"
        );
    }

    #[test]
    fn single_file_allows_no_origin_at_all() {
        let html = "<head><style>\nbody{}\n</style><script type=\"module\">alert('Hello, world.');</script></head>";
        let policy = for_page(html, Delivery::SingleFile).unwrap();
        assert!(!policy.contains("'self'"), "{policy}");
        assert!(policy.contains("connect-src 'none'"), "{policy}");
        assert!(
            policy.contains(&format!("style-src {}", hash_source("\nbody{}\n"))),
            "{policy}"
        );
    }

    #[test]
    fn policy_goes_right_after_the_charset_and_replaces_an_old_one() {
        let html = "<head><meta charset=\"utf-8\"><title>t</title></head>";
        let once = insert(html, "default-src 'none'").unwrap();
        assert_eq!(
            once,
            "<head><meta charset=\"utf-8\">\n  <meta http-equiv=\"Content-Security-Policy\" \
             content=\"default-src 'none'\"><title>t</title></head>"
        );
        let twice = insert(&once, "default-src 'self'").unwrap();
        assert_eq!(twice.matches(META_START).count(), 1, "{twice}");
        assert!(twice.contains("content=\"default-src 'self'\""), "{twice}");
    }

    #[test]
    fn unclosed_blocks_are_refused() {
        assert!(inline_hashes("<script>alert(1)", "script").is_err());
    }
}
