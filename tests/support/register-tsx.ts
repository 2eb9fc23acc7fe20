// Knex loads migrations and seeds with Node's own import(), which bypasses Vite's transform;
// registering tsx's loader in each worker lets those .ts files load as they do under `tsx`.
import { register } from 'tsx/esm/api'

register()
