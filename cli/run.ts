/** The bitslack command's entry: run the program on this process's arguments, exit with its code. */
import { main } from './main'

process.exitCode = await main(process.argv)
