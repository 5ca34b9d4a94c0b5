#![allow(dead_code)]
pub mod fixture;
