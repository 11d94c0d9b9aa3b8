// What the electrical core expects of whatever runs it. shared/ is checked with the ECMAScript
// library only (no DOM, no Node types); the few host functions it calls are declared here.
// Browsers, web workers and Node (17+) all provide them. Keep this list short: anything added
// here must exist in every one of those hosts.

/** HTML structured clone: a deep copy of plain data (objects, arrays, Maps, Sets, Dates). */
declare function structuredClone<T>(value: T): T;
