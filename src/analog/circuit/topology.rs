//! Wires joined, nodes numbered, and the structural checks a netlist must pass before
//! any equation is written.
//!
//! Zero-ohm resistors join their two nodes into one, so loops of wires (two pots at an
//! end stop in parallel) cannot make the equations singular. Node indices count the
//! joined non-ground nodes; `None` is gnd.

use super::netlist::{Element, Netlist, GND};
use crate::error::{Error, Result};
use std::collections::HashMap;

/// A union-find over dense ids, with path halving.
struct Groups {
    parent: Vec<usize>,
}

impl Groups {
    fn new(n: usize) -> Self {
        Groups { parent: (0..n).collect() }
    }

    fn find(&mut self, mut i: usize) -> usize {
        while self.parent[i] != i {
            self.parent[i] = self.parent[self.parent[i]];
            i = self.parent[i];
        }
        i
    }

    fn join(&mut self, a: usize, b: usize) {
        let (ra, rb) = (self.find(a), self.find(b));
        self.parent[ra] = rb;
    }
}

/// The nodes of a circuit after wires have joined them.
#[derive(Debug)]
pub struct Nodes {
    index: HashMap<String, Option<usize>>,
    names: Vec<Vec<String>>,
}

impl Nodes {
    /// The index of a node name of this netlist; `None` is gnd.
    pub fn of(&self, name: &str) -> Option<usize> {
        self.index.get(name).copied().flatten()
    }

    /// How many non-ground nodes there are.
    pub fn count(&self) -> usize {
        self.names.len()
    }

    /// The node as users wrote it, e.g. `node 'a'` or `node 'a' (= 'b' by wires)`.
    pub fn describe(&self, i: usize) -> String {
        let names = &self.names[i];
        let mut out = format!("node '{}'", names[0]);
        if names.len() > 1 {
            let others: Vec<String> = names[1..].iter().map(|n| format!("'{n}'")).collect();
            out += &format!(" (= {} by wires)", others.join(", "));
        }
        out
    }
}

/// A part with its nodes resolved; wires are gone.
#[derive(Debug, Clone, PartialEq)]
pub enum Branch {
    /// A resistor as a conductance.
    Conductance { a: Option<usize>, b: Option<usize>, siemens: f64 },
    /// A capacitor.
    Capacitor { a: Option<usize>, b: Option<usize>, farads: f64 },
    /// An inductor.
    Inductor { a: Option<usize>, b: Option<usize>, henries: f64 },
    /// An ideal op-amp.
    OpAmp { plus: Option<usize>, minus: Option<usize>, out: usize },
    /// An ideal voltage amplifier.
    Amp { gain: f64, input: Option<usize>, output: usize },
}

impl Branch {
    /// Pairs of nodes this branch links for the purpose of "is there a signal path":
    /// passive ends, and each sensed node to the driven one.
    fn links(&self) -> Vec<(Option<usize>, Option<usize>)> {
        match *self {
            Branch::Conductance { a, b, .. }
            | Branch::Capacitor { a, b, .. }
            | Branch::Inductor { a, b, .. } => vec![(a, b)],
            Branch::OpAmp { plus, minus, out } => vec![(plus, Some(out)), (minus, Some(out))],
            Branch::Amp { input, output, .. } => vec![(input, Some(output))],
        }
    }

    /// Pairs of nodes this branch lets current flow between (`None` is gnd): a driven
    /// output returns its current through gnd; inputs of amplifiers draw none.
    fn current_paths(&self) -> (Option<usize>, Option<usize>) {
        match *self {
            Branch::Conductance { a, b, .. }
            | Branch::Capacitor { a, b, .. }
            | Branch::Inductor { a, b, .. } => (a, b),
            Branch::OpAmp { out, .. } => (Some(out), None),
            Branch::Amp { output, .. } => (Some(output), None),
        }
    }

    /// Terminals counted for the floating-node check.
    fn terminals(&self) -> Vec<Option<usize>> {
        match *self {
            Branch::Conductance { a, b, .. }
            | Branch::Capacitor { a, b, .. }
            | Branch::Inductor { a, b, .. } => vec![a, b],
            Branch::OpAmp { plus, minus, out } => vec![plus, minus, Some(out)],
            Branch::Amp { input, output, .. } => vec![input, Some(output)],
        }
    }
}

/// A netlist with wires joined, checked for structure.
#[derive(Debug)]
pub struct Circuit {
    /// The joined nodes.
    pub nodes: Nodes,
    /// Each remaining part with the index of the part in the netlist.
    pub branches: Vec<(usize, Branch)>,
    /// The driven node.
    pub input: usize,
    /// The output node; `None` when wires join it to gnd.
    pub output: Option<usize>,
    /// Parts that were dropped because both ends are one node.
    pub warnings: Vec<String>,
}

/// Joins wires, numbers nodes and refuses netlists whose structure cannot give a
/// unique H(s): bad values, empty or clashing names, floating nodes, islands with no
/// path for current, an output the input cannot reach.
///
/// # Errors
/// [`Error::Input`] naming the part or node at fault.
pub fn resolve(netlist: &Netlist) -> Result<Circuit> {
    for part in &netlist.parts {
        part.check()?;
    }
    let (input, output) = (netlist.input.as_str(), netlist.output.as_str());
    check_ports(input, output)?;

    // Every name gets a dense id in order of first appearance; gnd is id 0.
    let mut ids: HashMap<&str, usize> = HashMap::new();
    let mut order: Vec<&str> = Vec::new();
    let all_names = [GND, input, output]
        .into_iter()
        .chain(netlist.parts.iter().flat_map(|p| p.element.nodes()));
    for name in all_names {
        ids.entry(name).or_insert_with(|| {
            order.push(name);
            order.len() - 1
        });
    }
    let mut groups = Groups::new(order.len());
    for part in &netlist.parts {
        if let Element::Resistor { ohms, a, b } = &part.element {
            if *ohms == 0.0 {
                groups.join(ids[a.as_str()], ids[b.as_str()]);
            }
        }
    }
    let ground_root = groups.find(0);
    let mut root_index: HashMap<usize, usize> = HashMap::new();
    let mut names: Vec<Vec<String>> = Vec::new();
    let mut index: HashMap<String, Option<usize>> = HashMap::new();
    for (id, &name) in order.iter().enumerate() {
        let root = groups.find(id);
        let node = (root != ground_root).then(|| {
            *root_index.entry(root).or_insert_with(|| {
                names.push(Vec::new());
                names.len() - 1
            })
        });
        if let Some(i) = node {
            names[i].push(name.to_string());
        }
        index.insert(name.to_string(), node);
    }
    let nodes = Nodes { index, names };

    let input_node = nodes.of(input).ok_or_else(|| {
        Error::input(format!("input node '{input}' is joined to gnd by 0-ohm resistors (wires)"))
    })?;
    let mut circuit = Circuit {
        output: nodes.of(output),
        input: input_node,
        branches: Vec::new(),
        warnings: Vec::new(),
        nodes,
    };
    for (k, part) in netlist.parts.iter().enumerate() {
        if let Some(branch) = circuit.branch(part)? {
            circuit.branches.push((k, branch));
        }
    }
    circuit.check_floating(netlist)?;
    circuit.check_islands()?;
    circuit.check_signal_path(input, output)?;
    Ok(circuit)
}

fn check_ports(input: &str, output: &str) -> Result<()> {
    for (role, name) in [("input", input), ("output", output)] {
        if name.trim().is_empty() {
            return Err(Error::input(format!("{role} node name must not be empty")));
        }
        if name == GND {
            return Err(Error::input(format!("{role} node must not be '{GND}'")));
        }
    }
    if input == output {
        return Err(Error::input(format!(
            "input and output must be different nodes, both are '{input}'"
        )));
    }
    Ok(())
}

impl Circuit {
    /// The resolved branch of one part, `None` for wires and for two-terminal parts
    /// whose ends are one node (they carry no current).
    fn branch(&mut self, part: &super::netlist::Part) -> Result<Option<Branch>> {
        let at = |name: &str| self.nodes.of(name);
        let label = &part.label;
        let two = |a: &str, b: &str| (at(a), at(b));
        let branch = match &part.element {
            Element::Resistor { ohms, .. } if *ohms == 0.0 => return Ok(None),
            Element::Resistor { ohms, a, b } => {
                let (a, b) = two(a, b);
                Branch::Conductance { a, b, siemens: 1.0 / ohms }
            }
            Element::Capacitor { farads, a, b } => {
                let (a, b) = two(a, b);
                Branch::Capacitor { a, b, farads: *farads }
            }
            Element::Inductor { henries, a, b } => {
                let (a, b) = two(a, b);
                Branch::Inductor { a, b, henries: *henries }
            }
            Element::OpAmp { plus, minus, out } => {
                let Some(out_node) = at(out) else {
                    return Err(Error::input(format!(
                        "{label}: op-amp output '{out}' must not be on gnd"
                    )));
                };
                if at(plus) == at(minus) {
                    return Err(Error::input(format!(
                        "{label}: op-amp inputs '{plus}' and '{minus}' must be different \
                         nodes, they are joined"
                    )));
                }
                Branch::OpAmp { plus: at(plus), minus: at(minus), out: out_node }
            }
            Element::Amp { gain, input, output } => {
                let Some(out_node) = at(output) else {
                    return Err(Error::input(format!(
                        "{label}: amp output '{output}' must not be on gnd"
                    )));
                };
                if at(input) == Some(out_node) {
                    return Err(Error::input(format!(
                        "{label}: amp input '{input}' and output '{output}' must be \
                         different nodes"
                    )));
                }
                Branch::Amp { gain: *gain, input: at(input), output: out_node }
            }
        };
        let passive = !matches!(branch, Branch::OpAmp { .. } | Branch::Amp { .. });
        let (a, b) = branch.current_paths();
        if passive && a == b {
            self.warnings.push(format!(
                "{label}: both ends are on one node, so it carries no current and is ignored"
            ));
            return Ok(None);
        }
        Ok(Some(branch))
    }

    /// A node that only one part terminal touches has an undetermined voltage (or sets
    /// a current to zero); the source counts at the input and the reading at the output.
    fn check_floating(&self, netlist: &Netlist) -> Result<()> {
        let n = self.nodes.count();
        let mut count = vec![0usize; n];
        let mut toucher: Vec<Option<usize>> = vec![None; n];
        count[self.input] += 1;
        if let Some(out) = self.output {
            count[out] += 1;
        }
        for (k, branch) in &self.branches {
            for node in branch.terminals().into_iter().flatten() {
                count[node] += 1;
                toucher[node] = Some(*k);
            }
        }
        for i in 0..n {
            if count[i] >= 2 {
                continue;
            }
            let node = self.nodes.describe(i);
            let message = match toucher[i] {
                Some(k) => format!(
                    "{node} is floating: only {} connects to it (1 terminal)",
                    netlist.parts[k].label
                ),
                None if i == self.input => format!("input {node} is not connected to any part"),
                None if Some(i) == self.output => {
                    format!("output {node} is not connected to any part")
                }
                None => format!("{node} is floating: only wires or shorted parts reach it"),
            };
            return Err(Error::input(message));
        }
        Ok(())
    }

    /// Every node needs a path for current to gnd (through parts, the source, or a
    /// driven output); an island's voltage is undetermined.
    fn check_islands(&self) -> Result<()> {
        let n = self.nodes.count();
        let ground = n;
        let mut groups = Groups::new(n + 1);
        groups.join(self.input, ground);
        for (_, branch) in &self.branches {
            let (a, b) = branch.current_paths();
            groups.join(a.unwrap_or(ground), b.unwrap_or(ground));
        }
        let ground_root = groups.find(ground);
        let island: Vec<usize> = (0..n).filter(|&i| groups.find(i) != ground_root).collect();
        if let Some(&first) = island.first() {
            let members: Vec<String> = island.iter().map(|&i| self.nodes.describe(i)).collect();
            return Err(Error::input(format!(
                "{} has no path for current to gnd or the input (island: {})",
                self.nodes.describe(first),
                members.join(", ")
            )));
        }
        Ok(())
    }

    fn check_signal_path(&self, input: &str, output: &str) -> Result<()> {
        let Some(out) = self.output else { return Ok(()) };
        if !self.reachable(self.input, None, None)[out] {
            return Err(Error::input(format!(
                "output node '{output}' is not connected to input node '{input}' through \
                 the circuit (paths through gnd do not count)"
            )));
        }
        Ok(())
    }

    /// Nodes reachable from `start` over part links without passing gnd or `blocked`,
    /// ignoring branch number `skip`.
    fn reachable(&self, start: usize, blocked: Option<usize>, skip: Option<usize>) -> Vec<bool> {
        let n = self.nodes.count();
        let mut adjacent: Vec<Vec<usize>> = vec![Vec::new(); n];
        for (j, (_, branch)) in self.branches.iter().enumerate() {
            if Some(j) == skip {
                continue;
            }
            for (a, b) in branch.links() {
                if let (Some(a), Some(b)) = (a, b) {
                    adjacent[a].push(b);
                    adjacent[b].push(a);
                }
            }
        }
        let mut seen = vec![false; n];
        let mut stack = vec![start];
        seen[start] = true;
        while let Some(i) = stack.pop() {
            for &j in &adjacent[i] {
                if !seen[j] && Some(j) != blocked {
                    seen[j] = true;
                    stack.push(j);
                }
            }
        }
        seen
    }

    /// The netlist index of the first op-amp whose output has no path back to either
    /// of its inputs other than through gnd or the driven input: the usual reason for
    /// singular equations.
    pub fn opamp_without_feedback(&self) -> Option<usize> {
        self.branches.iter().enumerate().find_map(|(j, (k, branch))| {
            let Branch::OpAmp { plus, minus, out } = *branch else { return None };
            let seen = self.reachable(out, Some(self.input), Some(j));
            let fed = [plus, minus].into_iter().flatten().any(|i| seen[i]);
            (!fed).then_some(*k)
        })
    }
}

#[cfg(test)]
mod tests {
    use super::super::netlist::Part;
    use super::*;

    fn r(ohms: f64, a: &str, b: &str) -> Part {
        Part {
            label: format!("r {a}-{b}"),
            element: Element::Resistor { ohms, a: a.into(), b: b.into() },
        }
    }

    fn netlist(parts: Vec<Part>) -> Netlist {
        Netlist { parts, input: "in".into(), output: "out".into() }
    }

    #[test]
    fn wires_join_nodes_and_loops_of_wires_are_harmless() {
        let c = resolve(&netlist(vec![
            r(1e3, "in", "a"),
            r(0.0, "a", "b"),
            r(0.0, "b", "a"),
            r(1e3, "b", "out"),
            r(1e3, "out", GND),
        ]))
        .unwrap();
        assert_eq!(c.nodes.count(), 3);
        assert_eq!(c.nodes.of("a"), c.nodes.of("b"));
        assert_eq!(c.nodes.describe(c.nodes.of("a").unwrap()), "node 'a' (= 'b' by wires)");
    }

    #[test]
    fn dangling_node_is_named_with_the_part_touching_it() {
        let err =
            resolve(&netlist(vec![r(1e3, "in", "out"), r(1e3, "out", GND), r(1e3, "out", "stub")]))
                .unwrap_err();
        assert_eq!(
            err.to_string(),
            "node 'stub' is floating: only r out-stub connects to it (1 terminal)"
        );
    }

    #[test]
    fn island_without_current_path_is_refused() {
        let err = resolve(&netlist(vec![
            r(1e3, "in", "out"),
            r(1e3, "out", GND),
            r(1e3, "x", "y"),
            r(2e3, "x", "y"),
        ]))
        .unwrap_err();
        assert!(err.to_string().starts_with("node 'x' has no path for current"), "{err}");
    }

    #[test]
    fn output_reached_only_through_gnd_is_refused() {
        let err =
            resolve(&netlist(vec![r(1e3, "in", GND), r(1e3, "out", GND), r(1e3, "out", GND)]))
                .unwrap_err();
        assert!(err.to_string().contains("not connected to input node 'in'"), "{err}");
    }

    #[test]
    fn opamp_driving_only_a_load_has_no_feedback() {
        let opamp = Part {
            label: "u1".into(),
            element: Element::OpAmp { plus: "in".into(), minus: "m".into(), out: "out".into() },
        };
        let c = resolve(&netlist(vec![
            r(1e3, "in", GND),
            opamp,
            r(1e3, "m", GND),
            r(1e3, "m", GND),
            r(1e3, "out", GND),
        ]))
        .unwrap();
        assert_eq!(c.opamp_without_feedback(), Some(1));
    }
}
