/** Ports of the two e2e stacks; each fake inbox sits two above its app (SMTP one above). */
export const plainPort = 3100;
export const demoPort = 3110;
