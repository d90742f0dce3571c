// Renderer entry: mounts the app with whichever API object this page has.
import { render } from 'preact';
import { App } from './app/app';
import { getApi } from './api/get-api';

const root = document.getElementById('app');
if (!root) throw new Error('index.html has no #app element');
render(<App api={getApi()} />, root);
