//! A temporary file for the readers that take a path, one per process.
pub fn with_file(data: &[u8], ext: &str, read: impl FnOnce(&std::path::Path)) {
    let p = std::env::temp_dir().join(format!("flowzone-fuzz-{}.{ext}", std::process::id()));
    std::fs::write(&p, data).expect("temp file");
    read(&p);
}
