// The engine's version. Every result names it; bump it whenever a change can alter a number.
export const ENGINE_VERSION = '0.2.0'
