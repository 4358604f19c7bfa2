"use strict";
/** Set-up descriptions used by the benchmarks, written as a user writes them. */

function setup(components, connections, signal, name) {
  return { format: "quietframe.setup", version: 1, name, components, connections, readout: ["detector"], signal };
}

/** A free mass read by a direct position probe, optional squeezed light (as the engine tests build it). */
function probedFreeMass({ mass, power, efficiency = 1, light, referTo }) {
  return setup(
    [
      light ?? { name: "light", type: "coherent" },
      { name: "body", type: "free-mass", params: { mass: `${mass} kg` } },
      { name: "probe", type: "position-probe", params: { power: `${power} W`, wavelength: "1064 nm" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency } },
    ],
    [
      ["light.out", "probe.in"],
      ["probe.out", "detector.in"],
      ["probe.mechanics", "body.body"],
    ],
    { kind: "force", on: "body", referTo },
    "free mass, position probe",
  );
}

/**
 * k oscillators read one after another by position probes in a single beam: every
 * oscillator adds one mode (two states) and one thermal input; the light gathers all
 * positions in its phase quadrature and pushes every oscillator with its amplitude.
 */
function probeChain(k) {
  const components = [{ name: "light", type: "coherent" }];
  const connections = [];
  let upstream = "light.out";
  for (let j = 1; j <= k; j++) {
    components.push({
      name: `osc${j}`,
      type: "oscillator",
      params: { mass: "10 ng", frequency: `${(1 + 0.13 * j).toFixed(2)} kHz`, Q: 1e4, temperature: "4 K" },
    });
    components.push({ name: `probe${j}`, type: "position-probe", params: { measurementRate: "50 Hz" } });
    connections.push([upstream, `probe${j}.in`], [`probe${j}.mechanics`, `osc${j}.body`]);
    upstream = `probe${j}.out`;
  }
  components.push({ name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: "95 %" } });
  connections.push([upstream, "detector.in"]);
  return setup(components, connections, { kind: "force", on: "osc1", referTo: "displacement" }, `${k} probed oscillators`);
}

module.exports = { probedFreeMass, probeChain };
