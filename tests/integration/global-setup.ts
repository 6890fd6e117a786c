// Replaced below once the server harness exists.
export default async function setup() {}
