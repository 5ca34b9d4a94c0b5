fn main() {
    let n: usize = std::env::args().nth(1).unwrap().parse().unwrap();
    let kb: usize = std::env::args().nth(2).unwrap().parse().unwrap();
    let kind = std::env::args().nth(3).unwrap();
    let text = match kind.as_str() {
        "paren" => format!("param p = {}1{}\n", "(".repeat(n), ")".repeat(n)),
        "neg" => format!("param p = {}1\n", "-".repeat(n)),
        "block" => format!(
            "{}node a\n{}",
            "repeat r (count = 1) {\n".repeat(n),
            "}\n".repeat(n)
        ),
        _ => panic!(),
    };
    let h = std::thread::Builder::new()
        .stack_size(kb * 1024)
        .spawn(move || {
            let (_m, d) = caloris_compiler::parser::parse(&text, caloris_compiler::span::FileId(0));
            d.len()
        })
        .unwrap();
    println!("{n} levels {kb} KB: {} diags", h.join().unwrap());
}
