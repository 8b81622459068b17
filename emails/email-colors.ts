export const emailColors = { ink: "#1b2330", paper: "#f7f5f0", teal: "#0e5e5b", muted: "#5b6472" };
