//! Model files named on the command line: files as given, folders searched for `*.heat`.

use std::path::{Path, PathBuf};

/// The model files named by `inputs`: each file as given (`-` for standard input), each folder
/// searched (sorted, hidden folders and `target` skipped, folder links not followed so a
/// link cycle cannot loop).
pub fn expand(inputs: &[PathBuf]) -> Result<Vec<PathBuf>, String> {
    if inputs.len() > 1 && inputs.iter().any(|f| f.as_os_str() == "-") {
        return Err("`-` (standard input) cannot be combined with file names".into());
    }
    let mut out = Vec::new();
    for input in inputs {
        if input.as_os_str() != "-" && input.is_dir() {
            collect(input, &mut out);
        } else {
            out.push(input.clone());
        }
    }
    Ok(out)
}

fn collect(dir: &Path, out: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    let mut paths: Vec<PathBuf> = entries.flatten().map(|e| e.path()).collect();
    paths.sort();
    for p in paths {
        let hidden = p
            .file_name()
            .is_some_and(|n| n.to_string_lossy().starts_with('.'));
        let real_dir = std::fs::symlink_metadata(&p).is_ok_and(|m| m.is_dir());
        if real_dir {
            if !hidden && !p.ends_with("target") {
                collect(&p, out);
            }
        } else if p.extension().is_some_and(|x| x == "heat") && p.is_file() {
            out.push(p);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn folders_are_searched_in_order_and_stdin_stands_alone() {
        let dir = tempfile::tempdir().expect("temp dir");
        let sub = dir.path().join("b");
        std::fs::create_dir(&sub).expect("mkdir");
        std::fs::create_dir(dir.path().join(".hidden")).expect("mkdir");
        for f in ["a.heat", "b/c.heat", ".hidden/d.heat", "notes.txt"] {
            std::fs::write(dir.path().join(f), "").expect("write");
        }
        let got = expand(&[dir.path().to_path_buf()]).expect("expand");
        let names: Vec<String> = got
            .iter()
            .map(|p| {
                p.strip_prefix(dir.path())
                    .expect("inside")
                    .display()
                    .to_string()
            })
            .collect();
        assert_eq!(names, ["a.heat", "b/c.heat"]);
        assert!(expand(&["-".into(), "x.heat".into()]).is_err());
    }
}
