// server-only is a bundler marker; under vitest the real server code runs in Node, so this stands in.
export {};
