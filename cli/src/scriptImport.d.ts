// `import text from './module?script'`: the module bundled as a browser script that defines the global
// `AmpnoteCharts`, as text (scripts/build.mjs).
declare module '*?script' {
  const text: string;
  export default text;
}
