// ink imports react-devtools-core only when DEV is set; the bundle carries this stub instead
export default { initialize() {}, connectToDevTools() {} };
