#![allow(dead_code)]
pub mod client;
pub mod corpus;
pub mod fixture;
pub mod in_process;
