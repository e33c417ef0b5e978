import { loadCvNode } from '../src/cli/cv-node.js';

loadCvNode();
