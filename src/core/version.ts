/** Tool version echoed in every result. A test keeps it equal to package.json's version. */
export const TOOL_NAME = 'fractozone';
export const TOOL_VERSION = '0.1.0';
