/**
 * The logical layout: how many surface-code patches the data qubits and the routing space between
 * them take. We use Litinski's fast data block (Litinski 2019, "A Game of Surface Codes:
 * Large-Scale Quantum Computing with Lattice Surgery", Quantum 3:128): n data qubits in
 * 2n + sqrt(8n) + 1 tiles, which lets any Pauli-product measurement (a T gate consuming a magic
 * state) reach every data qubit in one step. Routing is the tiles beyond the n data patches.
 */

/**
 * Where {@link routingPatches} comes from.
 *
 * @example
 * ```ts
 * `${routingPatches(60)} routing patches (${ROUTING_SOURCE})`; // 83 routing patches (...)
 * ```
 */
export const ROUTING_SOURCE =
  "Litinski 2019, \"A Game of Surface Codes\", Quantum 3:128: the fast data block, 2n + sqrt(8n) + 1 tiles for n data qubits (sqrt rounded up)";

/**
 * Patches of routing space for n data qubits in the fast block: n + ceil(sqrt(8n)) + 1.
 *
 * @example
 * ```ts
 * routingPatches(100); // 130 (2 x 100 + 29 + 1 tiles in all)
 * ```
 */
export function routingPatches(dataQubits: number): number {
  if (dataQubits <= 0) return 0;
  return dataQubits + Math.ceil(Math.sqrt(8 * dataQubits)) + 1;
}
