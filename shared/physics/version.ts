/**
 * Version of the physics core, stored with every scan so a result can be traced to the code
 * that produced it. Bump it whenever a change can move a computed number.
 */
export const PHYSICS_VERSION = '0.3.2';
